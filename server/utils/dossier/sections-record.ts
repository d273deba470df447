import QRCode from 'qrcode'
import type { PDFDocument } from 'pdf-lib'
import { formatBytes } from '#shared/evidence/kinds'
import { CHECKLIST_CAUTION } from '#shared/inspection/template'
import { BUS_WORDS } from '#shared/inspection/evaluate'
import type { BusKind } from '#shared/constants'
import { DIVISION_WORDS, type Division } from '#shared/rules/classes'
import { signedWith, type PdfLayout } from './pdf-layout'
import type { Manifest } from './manifest'
import { localStamp, utcStamp, type SealFacts } from './sections-result'

export function renderCourse(L: PdfLayout, m: Manifest) {
  const { course } = m
  const d = course.distance
  L.heading('Course, traps and survey')
  L.text(
    `${course.name}: heading ${course.headingDeg}°, survey tolerance ${course.surveyToleranceMm} mm. `
    + `Measured distance ${d.label} from ${d.entry} to ${d.exit}, nominal ${d.nominalM} m.`,
  )
  L.table(
    [
      { title: 'Trap', width: 100 },
      { title: 'Position from start (m)', width: 160, align: 'right' },
      { title: 'Elevation (m)', width: 120, align: 'right' },
    ],
    course.traps.map(t => [t.label, t.positionM, t.elevationM]),
  )
  L.heading('Timing equipment and calibration', 12)
  L.table(
    [
      { title: 'System', width: 120 },
      { title: 'Role', width: 60 },
      { title: 'Resolution', width: 75, align: 'right' },
      { title: 'Tolerance', width: 70, align: 'right' },
      { title: 'Calibration', width: 170 },
    ],
    m.timingSystems.map(s => [
      s.name,
      s.role,
      `1/${s.ticksPerSecond} s`,
      `${s.toleranceS} s`,
      `${s.calibratedOn} to ${s.calibrationExpires}`,
    ]),
  )
  // The clock each system's times of day are read on, and how it was set (dossiers issued since it is recorded).
  for (const s of m.timingSystems as (Manifest['timingSystems'][number] & { timeBase?: string })[]) {
    if (!s.timeBase) continue
    L.text(`${s.name}: its clock shows ${s.timeBase === 'utc' ? 'UTC' : `the event's local time (${m.event.timeZone})`}`
      + `; ${s.synchronisation ? `set ${s.synchronisation}` : 'how and when it was set is not recorded'}.`,
    { indent: 10, gap: 1 })
  }
}

export function renderInspection(L: PdfLayout, m: Manifest) {
  L.heading('Technical inspection')
  L.text(CHECKLIST_CAUTION, { color: 'grey' })
  if (!m.inspections.length) L.text('No signed inspection was in force when the counted runs started.', { bold: true })
  for (const i of m.inspections) renderOneInspection(L, i)
  renderPostRunCheck(L, m)
}

/** The machine checked after the record run, where the profile asks for it (newer dossiers only). */
function renderPostRunCheck(L: PdfLayout, m: Manifest) {
  const c = (m as { postRunCheck?: Manifest['postRunCheck'] }).postRunCheck
  if (!c) return
  L.text(`Post-run check: ${c.met ? 'met' : 'NOT MET'}. ${c.detail}.`, { bold: !c.met })
  L.text(`Signed by ${c.signature.typedName}, ${utcStamp(c.signature.at)} UTC; SHA-256 ${c.signature.sha256}`,
    { indent: 10, gap: 2 })
}

function renderOneInspection(L: PdfLayout, i: Manifest['inspections'][number]) {
  const bus = i.bus.voltageV
    ? `working voltage ${i.bus.voltageV} V ${i.bus.kind ? BUS_WORDS[i.bus.kind as BusKind] : ''}`
    : 'no high-voltage bus entered'
  const declared = i.declaredKmh ? `declared top speed ${i.declaredKmh} km/h` : 'no declared top speed'
  // Newer dossiers: the streamlining division the scrutineer saw.
  const division = (i as { division?: Division | null }).division
  const seen = division ? `; division seen: ${DIVISION_WORDS[division]}` : ''
  const clearance = i.clearance.cleared ? 'cleared to run' : `not cleared: ${i.clearance.why}`
  const runs = i.runs.length ? `in force at the start of run(s) ${i.runs.map(r => `#${r}`).join(', ')}` : 'the latest'
  L.text(
    `Inspection #${i.id} (${runs}), checklist ${i.checklist.name} v${i.checklist.version}; ${bus}; ${declared}`
    + `${seen}; ${clearance}.`,
  )
  L.table(
    [
      { title: 'Item', width: 150 },
      { title: 'Result', width: 50 },
      { title: 'Measured', width: 75 },
      { title: 'Against the limit (source)', width: 220 },
    ],
    i.answers.map(a => [
      // The checklist's own words for the item (a dossier sealed before labels were kept shows its key).
      (a as { label?: string }).label ?? a.item,
      a.withinLimit === false
        ? 'FAIL (measured)'
        : ({ pass: 'passed', fail: 'failed', na: 'not applicable' }[a.result]
          ?? a.result),
      a.enteredAs ?? '',
      // Not applicable: the scrutineer's reason, whatever limit the item has.
      a.result === 'na'
        ? (a.note ?? '')
        : a.limitSource
          ? `${a.withinLimit === false ? 'outside' : a.withinLimit ? 'within' : 'not judged'}`
          + `${a.check ? `: ${a.check}` : ''} (${a.limitSource})`
          : (a.note ?? ''),
    ]),
  )
  if (i.signature) {
    L.text(`Signed by ${i.signature.typedName} (${signedWith(i.signature.method)}), ${utcStamp(i.signature.at)} UTC; `
      + `SHA-256 ${i.signature.sha256}`)
  }
}

export function renderWeather(L: PdfLayout, m: Manifest) {
  L.heading('Weather and wind')
  L.table(
    [
      { title: 'Run', width: 60 },
      { title: 'Wind', width: 120 },
      { title: 'Heading', width: 60, align: 'right' },
      { title: 'Head (+) / tail (−)', width: 95, align: 'right' },
      { title: 'Cross', width: 60, align: 'right' },
      { title: 'Air', width: 100 },
    ],
    m.runs.map(({ id, direction, weather, wind }) => [
      `#${id} ${direction}`,
      weather ? `${weather.windSpeedMs} m/s from ${weather.windFromDeg}°` : 'not recorded',
      wind ? `${wind.headingDeg}°` : '',
      wind ? `${wind.headMs.toFixed(2)} m/s` : '',
      wind ? `${Math.abs(wind.crossMs).toFixed(2)} m/s` : '',
      weather ? `${weather.temperatureC ?? '—'} °C, ${weather.pressureHpa ?? '—'} hPa` : '',
    ]),
  )
}

type Statement = Manifest['statements'][number]

function renderStatement(L: PdfLayout, s: Statement) {
  if (s.withdraws) {
    L.text(
      `Statement #${s.id} withdraws #${s.withdraws}: ${s.reason}. `
      + `Signed ${s.typedName}, ${utcStamp(s.signedAt)} UTC.`,
      { bold: true },
    )
    return
  }
  const withdrawn = s.withdrawnBy ? ` (withdrawn by #${s.withdrawnBy})` : ''
  L.text(`Statement #${s.id} by ${s.typedName}${withdrawn}`, { bold: true, gap: 1 })
  // The runs ticked (newer dossiers) and, apart, in the official's own words.
  const ticked = ((s as { runIdsSeen?: number[] }).runIdsSeen ?? []).map(r => `#${r}`).join(', ')
  const seen = [ticked && `run(s) ${ticked}`, s.runsSeen].filter(Boolean).join('; in their words: ')
  L.text(
    `Runs seen: ${seen}. Watched from: ${s.position}. Conditions: ${s.conditions}. `
    + `Irregularities: ${s.irregularities || 'none'}.`,
    { indent: 10, gap: 1 },
  )
  L.text(`Signed ${utcStamp(s.signedAt)} UTC (${signedWith(s.method)}); SHA-256 ${s.sha256}`, {
    indent: 10,
    color: 'grey',
  })
}

export function renderStatements(L: PdfLayout, m: Manifest) {
  // A dossier sealed before the permit and appointments were kept has neither in its manifest.
  const officials = (m as { officials?: Manifest['officials'] }).officials
  if (officials) {
    L.heading('Permit and officials')
    L.text(officials.permit
      ? `Permit ${officials.permit.number} of ${officials.permit.issuingBody}, valid ${officials.permit.validFrom} to `
      + `${officials.permit.validTo}.`
      : 'No permit recorded.')
    for (const a of officials.appointments) L.text(`${a.label}: ${a.name}`, { indent: 10, gap: 1 })
  }
  renderStartLine(L, m)
  renderProtests(L, m)
  renderConfirmation(L, m)
  L.heading('Witness statements')
  for (const s of m.statements) renderStatement(L, s)
  // A dossier sealed before notices were kept has none in its manifest.
  const notices = (m as { notices?: Manifest['notices'] }).notices ?? []
  if (!notices.length) return
  L.heading('Official notices')
  for (const n of notices) {
    L.text(`Notice #${n.id}${n.attemptId ? ` on attempt #${n.attemptId}` : ' to the whole event'}: ${n.title}`,
      { bold: true, gap: 1 })
    L.text(n.body, { indent: 10, gap: 1 })
    L.text(`Issued by ${n.typedName} (${n.issuer}), ${utcStamp(n.at)} UTC; SHA-256 ${n.sha256}`,
      { indent: 10, color: 'grey' })
  }
}

export function renderEvidence(L: PdfLayout, m: Manifest, attachedShas: Set<string>) {
  L.heading('Evidence manifest')
  L.table(
    [
      { title: 'Kind', width: 90 },
      { title: 'Name', width: 120 },
      { title: 'Size', width: 55, align: 'right' },
      { title: 'SHA-256', width: 175 },
      { title: 'In this PDF', width: 55 },
    ],
    m.evidence.map(e => [
      e.kind,
      e.name,
      formatBytes(Number(e.size)),
      e.sha256,
      attachedShas.has(e.sha256) ? 'attached' : 'by hash',
    ]),
    { size: 7.5 },
  )
}

export function renderCorrections(L: PdfLayout, m: Manifest) {
  L.heading('Log of corrections')
  const corrections = m.runs.flatMap(x =>
    x.readings.filter(g => g.supersedes).map(g => [
      `#${x.id}`,
      g.trap ?? '',
      g.system,
      `${g.time} replaces #${g.supersedes}`,
      `${g.enteredBy}, ${localStamp(g.enteredAt, m.event.timeZone)}: ${g.reason}`,
    ]),
  )
  if (corrections.length) {
    L.table(
      [
        { title: 'Run', width: 40 },
        { title: 'Trap', width: 50 },
        { title: 'System', width: 80 },
        { title: 'New value', width: 130 },
        { title: 'Who, when, why', width: 195 },
      ],
      corrections,
    )
  }
  else {
    L.text('No reading was corrected.')
  }
  for (const s of m.timingSheet.filter(t => t.kind !== 'timing-sheet')) {
    L.text(`Timing sheet reopened by ${s.typedName}, ${utcStamp(s.at)} UTC: ${s.reason}`)
  }
}

const CAUTIONS = [
  'Speed-record attempts can hurt people. The sanctioning body\'s current rulebook decides; the chief',
  'scrutineer decides whether a machine may run; work on high-voltage systems follows qualified',
  'high-voltage practice. Trapline records what happened on the course and computes the figures by the',
  'rule profile above; it does not certify that a machine, a rider\'s kit or a course is safe. Rule values',
  'marked "from memory", "not settled" or "not known" must be checked against the rulebook in force.',
].join(' ')

export function renderCautions(L: PdfLayout) {
  L.heading('Cautions')
  L.text(CAUTIONS)
}

const SEAL_EXPLAINED = [
  'This dossier carries its manifest (manifest.json, canonical JSON) and the manifest\'s Ed25519 signature',
  'over its SHA-256 (manifest.sig) as attached files, with the evidence files small enough to travel inside.',
  'Drop the PDF on the verification page to check the seal, every attached file and whether this file is',
  'byte for byte the one issued.',
].join(' ')

/** The last page: the seal's figures and a QR code of the verification address. */
export async function renderSeal(L: PdfLayout, doc: PDFDocument, seal: SealFacts) {
  L.newPage().heading('Seal')
  L.text(SEAL_EXPLAINED, { gap: 10 })
  L.pairs([
    ['Manifest SHA-256', seal.sha256],
    ['Key fingerprint', seal.fingerprint],
    ['Verification', seal.verifyUrl],
    ['Seal (Ed25519, base64)', seal.signature],
  ])
  const png = await QRCode.toBuffer(seal.verifyUrl, { type: 'png', margin: 1, width: 300, errorCorrectionLevel: 'M' })
  const qr = await doc.embedPng(png)
  L.ensure(170)
  L.page.drawImage(qr, { x: 50, y: L.y - 160, width: 160, height: 160 })
  L.y -= 170
}

/** The rider's briefings, each run's expected speed and upgrade, and the clerk's overrides (newer dossiers only). */
function renderStartLine(L: PdfLayout, m: Manifest) {
  const line = (m as { startLine?: Manifest['startLine'] }).startLine
  if (!line) return
  L.heading('Start line and briefing')
  const rider = m.entry.rider
  L.text(`Rider ${rider.name}: licence ${rider.licenceNo}, valid to ${rider.licenceExpires}`
    + `${rider.licenceGrade ? `, grade ${rider.licenceGrade}` : ''}`
    + `${rider.medicalExpires ? `; medical valid to ${rider.medicalExpires}` : ''}.`, { gap: 2 })
  if (!line.briefings.length) L.text('No riders\' briefing recorded at the event.', { gap: 2 })
  for (const b of line.briefings) {
    L.text(`${b.title}, held ${utcStamp(b.heldAt)} UTC: ${b.signOn
      ? `signed on by ${b.signOn.name} ${b.signOn.onDevice === 'own'
        ? 'on their own device'
        : 'in person on the '
          + 'organiser\'s device'}, ${utcStamp(b.signOn.at)} UTC; SHA-256 ${b.signOn.sha256}`
      : 'the rider did not sign on'}`, { indent: 10, gap: 1 })
  }
  for (const r of line.runs) {
    const parts = [r.expectedKmh ? `expected ${r.expectedKmh} km/h` : 'no expected speed',
      r.licenceUpgrade ? `licence upgrade run to ${r.licenceUpgrade}` : '',
      r.overrideId ? `started under override #${r.overrideId}` : ''].filter(Boolean)
    L.text(`Run #${r.id}: ${parts.join('; ')}`, { indent: 10, gap: 1 })
  }
  for (const o of line.overrides) {
    L.text(`Override #${o.id} by the clerk of the course ${o.clerk} for ${o.day}: ${o.codes.join(', ')}. `
      + `Reason: ${o.reason}. SHA-256 ${o.sha256}`, { indent: 10, gap: 1 })
  }
  // Newer dossiers: the speed reached against the grade, the tyres and the parachutes, after the last run.
  const reached = (line as { speedReached?: string[] }).speedReached
  if (!reached) return
  if (!reached.length) {
    L.text('Speed reached: within the rider\'s grade, the tyres\' rating and the parachutes fitted.', { gap: 1 })
  }
  for (const f of reached) L.text(`Speed reached: ${f}.`, { bold: true, gap: 1 })
}

/** The stewards' confirmation of the result (newer dossiers only). */
function renderConfirmation(L: PdfLayout, m: Manifest) {
  const c = (m as { confirmation?: Manifest['confirmation'] }).confirmation
  if (!c) return
  L.heading('Confirmation of the result by the stewards')
  if (!c.signers.length) L.text('Not confirmed by the stewards at the issue of this dossier.', { gap: 2 })
  else {
    L.text(`Confirmed after the protest and appeal periods, which ended at ${c.after}; ${c.quorum} steward(s) `
      + 'sign under the profile.', { gap: 1 })
  }
  for (const s of c.signers) L.text(`${s.name}, ${utcStamp(s.at)} UTC; SHA-256 ${s.sha256}`, { indent: 10, gap: 1 })
}

/** Protests and appeals on the attempt with their hearings and decisions (newer dossiers only). */
function renderProtests(L: PdfLayout, m: Manifest) {
  const list = (m as { protests?: Manifest['protests'] }).protests
  if (!list) return
  L.heading('Protests and appeals')
  if (!list.length) L.text('None lodged on this attempt up to the issue of this dossier.')
  for (const p of list) {
    L.text(`${p.appealOf ? `Appeal #${p.id} against the decision on protest #${p.appealOf}` : `Protest #${p.id}`} `
      + `by ${p.team} (${p.kind}), lodged ${p.lodged}, deadline ${p.deadline}`, { bold: true, gap: 1 })
    L.text(`Grounds: ${p.grounds}${p.feeNote ? ` Fee: ${p.feeNote} (noted, not collected by Trapline).` : ''}`,
      { indent: 10, gap: 1 })
    L.text(p.outcome
      ? `Heard ${p.heard ? `${localStamp(p.heard, m.event.timeZone)}, ${utcStamp(p.heard)} UTC` : ''}, `
      + `present: ${p.present}. ${p.hearing} `
      + `Decision: ${p.outcome}, by ${p.decidedBy}, ${p.decided}. Reasons: ${p.reasons}`
      : 'Not yet decided.', { indent: 10 })
  }
}
