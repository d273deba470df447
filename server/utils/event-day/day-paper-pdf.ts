import { PDFDocument } from 'pdf-lib'
import type { DayPaper, TimeSlip } from './day-paper'
import type { PaperSheet } from '#shared/constants'

const CAUTION = 'Provisional until the timing sheet is signed. The sanctioning body\'s current rulebook, the chief '
  + 'scrutineer and qualified high-voltage practice decide; Trapline records and computes, it does not certify safety.'

async function newPaper(title: string, header: string) {
  const doc = await PDFDocument.create()
  doc.setTitle(title)
  doc.setProducer('Trapline')
  doc.setCreator('Trapline')
  return { doc, L: new PdfLayout(doc, await embedDossierFonts(doc), header) }
}

async function done(doc: PDFDocument, L: PdfLayout) {
  L.finish()
  return doc.save()
}

const fig = (x: string | null, unit: string) => (x ? `${x} ${unit}` : '—')

/** A run's time slip on one page: handed to the team, shown at the impound. */
export async function timeSlipPdf(s: TimeSlip) {
  const { doc, L } = await newPaper(`Time slip, run #${s.run.id}`, `${s.event.name} · time slip`)
  L.heading(`Time slip · run #${s.run.id}`, 20)
  L.pairs([
    ['Event', `${s.event.name}, ${s.event.venue}`],
    ['Left the line', `${s.run.startedAt} (${s.event.timeZone})`],
    ['Direction', `${s.run.direction}, ${s.run.start === 'standing' ? 'standing start' : 'flying pass'}`],
    ['Machine', s.entry.machineName],
    ['Rider', s.entry.riderName],
    ['Team', s.entry.teamName],
    ['Class', s.entry.className],
    ['Attempt', `#${s.run.attemptId}`],
    ...(s.run.status === 'aborted' ? [['Aborted', s.run.abortedReason ?? ''] as [string, string]] : []),
  ])
  L.heading('Over each measured distance', 12)
  L.table(
    [{ title: 'Distance', width: 170 }, { title: 'Time', width: 90, align: 'right' },
      { title: 'km/h', width: 110, align: 'right' }, { title: 'mph', width: 110, align: 'right' }],
    s.distances.map(d => [d.label, d.timeS ? `${d.timeS} s` : '—', d.kmh ?? '—', d.mph ?? '—']),
    { size: 11 },
  )
  L.heading('Times of day at the traps', 12)
  for (const r of s.readings) {
    L.text(`${r.system} (${r.role})`, { bold: true })
    L.table([{ title: 'Trap', width: 120 }, { title: 'Time of day', width: 140, align: 'right' }],
      r.times.map(t => [t.trap, t.time]))
  }
  for (const f of s.findings) L.text(`${f.severity === 'fail' ? 'X' : '!'} ${f.message}`)
  L.text(s.sheetSigned ? 'The timing sheet of this attempt is signed.' : CAUTION, { color: 'grey', gap: 18 })
  L.text('Timekeeper: ______________________________   Received by the team: ______________________________')
  L.text(`Printed ${s.printedAt} (${s.event.timeZone})`, { color: 'grey', size: 8 })
  return done(doc, L)
}

function startList(L: PdfLayout, p: DayPaper) {
  L.heading('Start list', 14)
  L.table(
    [{ title: 'Team', width: 110 }, { title: 'Machine', width: 120 }, { title: 'Rider', width: 95 },
      { title: 'Class', width: 95 }, { title: 'Distances', width: 75 }],
    p.startList.map(e => [e.teamName, e.machineName, e.riderName, e.className, e.distances]),
  )
  L.heading(`Run order, ${p.date}`, 14)
  L.table(
    [{ title: '#', width: 25, align: 'right' }, { title: 'Left', width: 55 }, { title: 'Run', width: 40 },
      { title: 'Machine', width: 120 }, { title: 'Rider', width: 95 }, { title: 'Dir.', width: 40 },
      { title: 'Time', width: 55, align: 'right' }, { title: 'km/h', width: 65, align: 'right' }],
    p.runOrder.map(r => [String(r.order), r.startedAt, `#${r.runId}`, r.machineName, r.riderName, r.direction,
      r.timeS ? `${r.timeS} s` : (r.status === 'aborted' ? 'aborted' : '—'), r.kmh ?? '—']),
  )
}

function results(L: PdfLayout, p: DayPaper) {
  if (!p.results.length) L.text('No run on this day.')
  for (const c of p.results) {
    L.heading(c.className, 13)
    L.table(
      [{ title: 'Machine', width: 120 }, { title: 'Rider', width: 90 }, { title: 'Distance', width: 85 },
        { title: 'Result', width: 95, align: 'right' }, { title: 'Verdict', width: 105 }],
      c.attempts.flatMap(a => a.distances.map(d => [a.machineName, a.riderName, d.label, fig(d.kmh, 'km/h'),
        !d.kmh
          ? 'awaiting the pair'
          : !d.valid
              ? 'fails the profile'
              : d.beatsRecord ? 'beats the record' : d.record ? 'does not beat it' : 'valid'])),
    )
  }
}

/** A run sheet to fill by hand when everything fails: a block per run with a line per trap and system. */
function blankRunSheet(L: PdfLayout, p: DayPaper) {
  L.text('Entry: ______________________  Direction: out / back  Left the line at: ________ (' + p.event.timeZone + ')')
  for (let run = 1; run <= 3; run++) {
    L.heading(`Run ${run}`, 12)
    L.table(
      [
        { title: 'Trap', width: 95 },
        ...p.systems.map(s => ({ title: `${s.name} (1/${s.ticksPerSecond} s)`, width: 200 })),
      ],
      p.traps.map(t => [t, ...p.systems.map(() => '____ : ____ : ____ . ________')]),
      { size: 10 },
    )
  }
  L.text('Timekeeper: ______________________________   Signature: ______________________________')
}

/** One of the day's papers as a PDF. */
export async function dayPaperPdf(p: DayPaper, sheet: PaperSheet) {
  const titles: Record<PaperSheet, string> = {
    'results': `Results by class, ${p.date}`,
    'start-list': `Start list and run order, ${p.date}`,
    'blank-run-sheet': 'Run sheet to fill by hand',
  }
  const { doc, L } = await newPaper(titles[sheet], `${p.event.name} · ${titles[sheet]}`)
  L.heading(titles[sheet], 18)
  L.text(`${p.event.name}, ${p.event.venue} · times in ${p.event.timeZone}`, { color: 'grey' })
  if (sheet === 'results') results(L, p)
  if (sheet === 'start-list') startList(L, p)
  if (sheet === 'blank-run-sheet') blankRunSheet(L, p)
  L.text(CAUTION, { color: 'grey', size: 8 })
  return done(doc, L)
}
