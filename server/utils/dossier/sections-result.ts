import { setAsideRule } from '#shared/rules/findings'
import { describeRuleValue, ruleLabels } from '#shared/rules/profile'
import { signedWith, type PdfLayout } from './pdf-layout'
import type { Manifest } from './manifest'

/** What the dossier says about the seal on its cover and on its last page. */
export interface SealFacts { sha256: string, signature: string, fingerprint: string, verifyUrl: string }

/** An ISO instant as the dossier prints it: `2026-09-14 08:02:11`, always UTC. */
export const utcStamp = (iso: string) => iso.replace('T', ' ').slice(0, 19)

const roundingWord = (m: Manifest) => (m.profile.figures.value.rounding === 'truncate' ? 'truncated' : 'rounded')
const meanOfTimes = (m: Manifest) => m.profile.averaging.value === 'mean-of-times'
const averageWords = (m: Manifest) =>
  (meanOfTimes(m) ? 'distance over the mean of the two times' : 'mean of the two speeds')

function validLine(m: Manifest) {
  if (!m.result.valid) return 'NO: see the computation\'s findings'
  const setAside = [...m.result.findings, ...m.runs.flatMap(r => r.findings ?? [])].filter(f => f.setAside).length
  return setAside
    ? `yes: ${setAside} failing finding(s) set aside by a signed decision of the stewards (or, for a time one `
    + 'system lacks, the chief timekeeper\'s signed account), printed with the computation'
    : 'yes: no finding fails it'
}

function standingRecordLine(m: Manifest) {
  const { standingRecord, beatsRecord, required } = m.result
  if (!standingRecord) return 'none in the book'
  const needed = required ? ` (at least ${required.figure} ${required.unit} needed)` : ''
  // In the unit the record was published in, compared in that unit.
  return `${standingRecord.speed} ${standingRecord.unit}; ${beatsRecord ? 'beaten' : 'not beaten'}${needed}`
}

/** Where the same passes claim other distances: each has its own dossier, from the same readings. */
function claimsLine(m: Manifest): [string, string][] {
  const others = (m.result.claims ?? []).filter(c => c.label !== m.course.distance.label)
  if (!others.length) return []
  const words = others.map(c => `${c.label} (${c.nominalM} m${c.kmh ? `, ${c.kmh} km/h` : ''})`).join('; ')
  return [['Also claimed from these passes', `${words}: each in a dossier of its own, from the same readings`]]
}

export function renderCover(L: PdfLayout, m: Manifest, seal: SealFacts) {
  const d = m.course.distance
  L.y -= 60
  L.text(m.dossier.copy === 'public' ? 'SPEED RECORD DOSSIER · PUBLIC COPY' : 'SPEED RECORD DOSSIER', {
    size: 10,
    bold: true,
    color: 'grey',
  })
  if (m.dossier.copy === 'public') {
    L.text('The rider\'s licence number and personal files are withheld here; the officials\' copy holds them, '
      + 'sealed the same way.', { size: 9, color: 'grey' })
  }
  L.heading(m.entry.machine.name, 26)
  L.text(`Rider ${m.entry.rider.name} · ${m.entry.teamName}`, { size: 13 })
  L.text(`${m.entry.className} · ${d.label} (${d.nominalM} m)`, { size: 13, gap: 20 })
  L.heading(`${m.result.kmh ?? '—'} km/h`, 34)
  const decimals = m.profile.figures.value.decimals
  L.text(
    `${m.result.mph ?? '—'} mph · ${averageWords(m)}, ${roundingWord(m)} to ${decimals} decimals`,
    { size: 11, gap: 16 },
  )
  const window = m.result.window
  L.pairs([
    ['Event', `${m.event.name}, ${m.event.venue}`],
    ['Rule profile', `${m.profile.name}, version ${m.profile.version}`],
    ['Time window', `${window?.ok ? 'within' : 'NOT within'}: ${window?.rule ?? ''}`],
    ['Valid under the profile', validLine(m)],
    ['Standing record', standingRecordLine(m)],
    ...claimsLine(m),
    ['Dossier', `version ${m.dossier.version}, sealed ${utcStamp(m.dossier.issuedAt)} UTC`],
    ['Manifest SHA-256', seal.sha256],
  ])
  L.text(
    'The sanctioning body decides on ratification under its current rulebook. '
    + 'Trapline records and computes; it does not certify safety.',
    { color: 'grey' },
  )
}

type Run = Manifest['runs'][number]

/** An instant on the event's clock, its zone named: `2026-09-14 02:02:11 (America/Denver)`. */
export function localStamp(iso: string, timeZone: string) {
  const parts = new Intl.DateTimeFormat('sv-SE', {
    timeZone, year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', second: '2-digit',
    hourCycle: 'h23',
  }).format(new Date(iso))
  return `${parts} (${timeZone})`
}

function renderRunHeader(L: PdfLayout, m: Manifest, run: Run) {
  const aborted = run.status === 'aborted' ? `, aborted: ${run.abortedReason}` : ''
  const counted = run.counted ? '' : ' (not counted)'
  // On the event's clock first, as the trap times below read, and in UTC beside it.
  const started = `${localStamp(run.startedAt, m.event.timeZone)}, ${utcStamp(run.startedAt)} UTC`
  L.text(`Run #${run.id}, ${run.direction}, started ${started}${aborted}${counted}`, { bold: true })
}

/** Whether a timing system's clock shows UTC (a dossier sealed before time bases were kept: the event's clock). */
const showsUtc = (m: Manifest, system: string) =>
  (m.timingSystems as { name: string, timeBase?: string }[]).find(s => s.name === system)?.timeBase === 'utc'

function readingState(g: Run['readings'][number]) {
  if (!g.current) return 'superseded'
  if (g.supersedes) return `correction of #${g.supersedes}: ${g.reason}`
  return g.source ? `from the device file ${g.source.name}, SHA-256 ${g.source.sha256.slice(0, 16)}…` : 'as entered'
}

function renderRunComputation(L: PdfLayout, m: Manifest, run: Run) {
  const d = m.course.distance
  renderRunHeader(L, m, run)
  L.text(`Times of day on each system's clock: the event's local time (${m.event.timeZone}) unless marked UTC.`, {
    color: 'grey', indent: 10,
  })
  L.table(
    [
      { title: 'Trap', width: 60 },
      { title: 'System', width: 110 },
      { title: 'Time of day', width: 95, align: 'right' },
      { title: 'State', width: 230 },
    ],
    run.readings.map(g => [g.trap ?? '', g.system, `${g.time}${showsUtc(m, g.system) ? ' UTC' : ''}`, readingState(g)]),
  )
  if (run.official) {
    const [from, to] = run.direction === 'out' ? [d.entry, d.exit] : [d.exit, d.entry]
    const { timeS, kmh, mph } = run.official
    L.text(`Time over the ${d.label.toLowerCase()}: t = time at ${to} − time at ${from} = ${timeS} s`, {
      indent: 10,
    })
    L.text(
      `Speed: v = d / t = ${d.nominalM} m / ${timeS} s = ${kmh} km/h = ${mph} mph `
      + `(computed exactly, then ${roundingWord(m)})`,
      { indent: 10 },
    )
  }
  for (const c of run.crossChecks) {
    L.text(
      `Cross-check, ${c.label}: primary and backup differ by ${c.differenceS} s; `
      + `tolerance ${c.toleranceS} s: ${c.ok ? 'agree' : 'DISAGREE'}`,
      { indent: 10, color: 'grey' },
    )
  }
  L.y -= 6
}

const UNITS_NOTE = '1 km/h = 1/3.6 m/s; 1 mph = 0.44704 m/s exactly; 1 mile = 1609.344 m (NIST SP 811, appendix B).'

/** The pair's result, shown by the computation the profile used and no other. */
function renderPairResult(L: PdfLayout, m: Manifest) {
  const d = m.course.distance
  const { meanTimeS, kmh, mph } = m.result
  L.text('Result', { bold: true })
  if (meanOfTimes(m)) {
    L.text(`Mean time = (t1 + t2) / 2 = ${meanTimeS} s`, { indent: 10 })
    L.text(`v = d / mean time = ${d.nominalM} m / ${meanTimeS} s = ${kmh} km/h = ${mph} mph. ${UNITS_NOTE}`, {
      indent: 10,
      gap: 10,
    })
    return
  }
  const speeds = m.runs.filter(r => r.counted && r.official).map(r => r.official!)
  L.text(`Speeds: v1 = ${speeds[0]?.kmh} km/h, v2 = ${speeds[1]?.kmh} km/h (each d / t, exactly)`, { indent: 10 })
  L.text(`v = (v1 + v2) / 2 = ${kmh} km/h = ${mph} mph, from the exact speeds. ${UNITS_NOTE}`, {
    indent: 10,
    gap: 10,
  })
}

/** A finding, and beside it the signed decision that set it aside: the stewards', or the chief timekeeper's account. */
function renderFinding(L: PdfLayout, f: Manifest['result']['findings'][number]) {
  L.text(`Finding ${f.code}${f.severity === 'fail' ? ' (fails the profile)' : ''}: ${f.message}`, { color: 'grey' })
  if (f.setAside) {
    const by = setAsideRule(f.code).authority === 'chief-timekeeper'
      ? 'the chief timekeeper\'s signed account'
      : 'a decision of the stewards'
    L.text(
      `SET ASIDE by ${by} (${f.setAside.by}), ${f.setAside.at}, signed decision `
      + `#${f.setAside.id}: ${f.setAside.reason}`,
      { indent: 10, bold: true },
    )
  }
}

function renderProfileInForce(L: PdfLayout, m: Manifest) {
  L.heading('Rule profile in force', 12)
  // A profile frozen before a rule value existed prints the values it holds.
  const keys = (Object.keys(ruleLabels) as (keyof typeof ruleLabels)[]).filter(k => m.profile[k] !== undefined)
  L.table(
    [
      { title: 'Rule', width: 110 },
      { title: 'Value', width: 150 },
      { title: 'Source', width: 235 },
    ],
    keys.map((k) => {
      const rule = m.profile[k]!
      return [ruleLabels[k], describeRuleValue(k, rule.value), `${rule.source} (${rule.certainty})`]
    }),
  )
}

/** Every run's readings and the arithmetic from them to the result, then the profile it followed. */
export function renderComputation(L: PdfLayout, m: Manifest) {
  L.newPage().heading('Computation sheet')
  for (const run of m.runs) renderRunComputation(L, m, run)
  if (m.result.kmh) renderPairResult(L, m)
  const runFindings = m.runs.filter(r => r.counted)
    .flatMap(r => (r.findings ?? []).map(f => ({ ...f, message: `run #${r.id}: ${f.message}` })))
  for (const f of [...m.result.findings, ...runFindings]) renderFinding(L, f)
  renderProfileInForce(L, m)
}

export function renderTimingSheet(L: PdfLayout, m: Manifest) {
  L.heading('Signed timing sheet')
  L.table(
    [
      { title: 'Act', width: 90 },
      { title: 'By', width: 100 },
      { title: 'When (UTC)', width: 100 },
      { title: 'SHA-256 of the sheet / reason', width: 205 },
    ],
    m.timingSheet.map(s => [
      `${s.kind === 'timing-sheet' ? 'Signed' : 'Reopened'} (${signedWith(s.method)})`,
      s.typedName,
      utcStamp(s.at),
      s.reason ? `${s.sha256} — ${s.reason}` : s.sha256,
    ]),
  )
}
