import { createHash, randomUUID } from 'node:crypto'
import { writeFile } from 'node:fs/promises'
import { deflateSync } from 'node:zlib'
import { join } from 'node:path'
import fontkit from '@pdf-lib/fontkit'
import { desc, eq, sql } from 'drizzle-orm'
import { PDFDocument } from 'pdf-lib'
import QRCode from 'qrcode'
import { formatBytes } from '#shared/evidence/kinds'
import { describeRuleValue, ruleLabels } from '#shared/rules/profile'
import { formatTimeOfDay } from '#shared/rules/timing'
import { CHECKLIST_CAUTION } from '#shared/inspection/template'
import { PdfLayout, type Fonts } from './pdf-layout'

export const DOSSIER_FORMAT = 'trapline-dossier/1'
const sha256Hex = (b: Uint8Array | string) => createHash('sha256').update(b).digest('hex')

async function loadFonts(doc: PDFDocument): Promise<Fonts> {
  doc.registerFontkit(fontkit)
  const read = async (base: string, file: string) => {
    const raw = await useStorage(`assets:${base}`).getItemRaw(file)
    if (!raw) throw new Error(`font ${file} is missing from the server assets`)
    return new Uint8Array(raw as ArrayBuffer)
  }
  // Subset: fontsource ships .woff, which embeds correctly only when subset.
  return {
    sans: await doc.embedFont(await read('fonts-inter', 'inter-latin-400-normal.woff'), { subset: true }),
    bold: await doc.embedFont(await read('fonts-inter', 'inter-latin-700-normal.woff'), { subset: true }),
    serif: await doc.embedFont(await read('fonts-merriweather', 'merriweather-latin-700-normal.woff'), {
      subset: true,
    }),
  }
}

/** The canonical manifest of a dossier: everything its figures and signatures rest on. */
export async function buildManifest(r: Awaited<ReturnType<typeof readinessOf>>, version: number, issuedAt: Date) {
  const { day, live, entry, distance } = r
  const attempt = day.attempts.find(a => a.id === r.attemptId)!
  const trapLabel = new Map(day.traps.map(t => [t.id, t.label]))
  const sys = new Map(day.systems.map(s => [s.id, s]))
  const runs = day.runs.filter(x => x.attemptId === r.attemptId)
  const inspection = r.clearance.inspectionId ? await inspectionView(r.clearance.inspectionId) : null
  const course = day.courses.find(c => c.id === distance.courseId)!
  return {
    format: DOSSIER_FORMAT,
    dossier: { attempt: r.attemptId, version, issuedAt: issuedAt.toISOString() },
    event: { id: day.event.id, name: day.event.name, venue: day.event.venue, timeZone: day.event.timeZone },
    entry: {
      ...live.entry,
      machine: {
        name: entry.machine.name,
        power: entry.machine.power,
        declaredMassKg: entry.machine.declaredMassKg,
        division: entry.machine.division,
      },
      rider: {
        name: entry.rider.name,
        licenceNo: entry.rider.licenceNo,
        licenceExpires: entry.rider.licenceExpires,
      },
    },
    profile: attempt.profile,
    course: {
      name: course.name,
      headingDeg: course.headingDeg,
      surveyToleranceMm: course.surveyToleranceMm,
      traps: day.traps
        .filter(t => t.courseId === course.id)
        .map(t => ({ label: t.label, positionM: t.positionM, elevationM: t.elevationM })),
      distance: {
        label: distance.label,
        nominalM: distance.nominalM,
        entry: trapLabel.get(distance.entryTrapId),
        exit: trapLabel.get(distance.exitTrapId),
      },
    },
    timingSystems: day.systems.map(s => ({
      name: s.name,
      role: s.role,
      ticksPerSecond: s.ticksPerSecond,
      toleranceS: s.toleranceS,
      calibratedOn: s.calibratedOn,
      calibrationExpires: s.calibrationExpires,
      description: s.description,
    })),
    runs: runs.map((x) => {
      const lr = live.runs.find(l => l.id === x.id)!
      return {
        id: x.id,
        direction: x.direction,
        startedAt: x.startedAt.toISOString(),
        status: x.status,
        abortedReason: x.abortedReason,
        counted: lr.counted,
        readings: day.readings
          .filter(g => g.runId === x.id)
          .map(g => ({
            id: g.id,
            trap: trapLabel.get(g.trapId),
            system: sys.get(g.systemId)!.name,
            time: formatTimeOfDay(g.ticks, BigInt(sys.get(g.systemId)!.ticksPerSecond)),
            ticks: g.ticks.toString(),
            current: g.current,
            supersedes: g.supersedesId,
            reason: g.reason,
            enteredBy: g.enteredBy,
            enteredAt: g.enteredAt.toISOString(),
          })),
        official: lr.official,
        crossChecks: lr.crossChecks,
        weather: lr.weather,
        wind: lr.wind,
      }
    }),
    result: {
      ...live.result,
      window: live.window,
      beatsRecord: live.beatsRecord,
      standingRecordKmh: live.standingRecordKmh,
      required: live.required,
      findings: live.findings.map(f => ({ code: f.code, message: f.message })),
    },
    timingSheet: live.sheet.history.map(h => ({
      kind: h.kind,
      typedName: h.typedName,
      at: new Date(h.at).toISOString(),
      sha256: h.sha256,
      reason: h.reason,
    })),
    inspection: inspection && {
      id: inspection.inspection.id,
      checklist: {
        id: inspection.inspection.checklist.id,
        name: inspection.inspection.checklist.name,
        version: inspection.inspection.checklist.version,
      },
      bus: { voltageV: inspection.inspection.busVoltageV, kind: inspection.inspection.busKind },
      clearance: inspection.clearance,
      answers: inspection.answers.map(a => ({
        item: a.itemKey,
        result: a.result,
        enteredAs: a.enteredAs,
        note: a.note,
      })),
      signature: inspection.signature && {
        typedName: inspection.signature.typedName,
        at: new Date(inspection.signature.at).toISOString(),
        sha256: inspection.signature.sha256,
      },
    },
    statements: (await statementsAt(day.event.id, null))
      .filter(s => s.attemptId === r.attemptId)
      .map(s => ({
        id: s.id,
        author: s.author,
        typedName: s.typedName,
        signedAt: new Date(s.signedAt).toISOString(),
        sha256: s.sha256,
        runsSeen: s.runsSeen,
        position: s.position,
        conditions: s.conditions,
        irregularities: s.irregularities,
        withdraws: s.withdrawsId,
        reason: s.reason,
        withdrawnBy: s.withdrawnBy?.id ?? null,
      })),
    evidence: r.evidence
      .filter(e => isForAttempt(e, r))
      .map(e => ({
        id: e.id,
        kind: e.kind,
        name: e.originalName,
        mediaType: e.mediaType,
        size: e.size,
        sha256: e.sha256,
      })),
  }
}

type Manifest = Awaited<ReturnType<typeof buildManifest>>

/** Evidence of the event that belongs in this attempt's file: its own, its entry's, its runs', the course's and the timing systems'. */
function isForAttempt(e: typeof tables.evidence.$inferSelect, r: Awaited<ReturnType<typeof readinessOf>>) {
  const runIds = new Set(r.day.runs.filter(x => x.attemptId === r.attemptId).map(x => x.id))
  return (
    e.attemptId === r.attemptId
    || (e.runId !== null && runIds.has(e.runId))
    || e.entryId === r.entry.entry.id
    || e.courseId === r.distance.courseId
    || e.timingSystemId !== null
    || (e.inspectionId !== null && e.inspectionId === r.clearance.inspectionId)
  )
}

/** The PDF: every section of the file, the manifest and its seal attached, small evidence files inside. */
export async function renderDossier(
  m: Manifest,
  seal: { sha256: string, signature: string, fingerprint: string, verifyUrl: string },
  attach: { name: string, bytes: Uint8Array, mediaType: string, sha256: string }[],
) {
  const doc = await PDFDocument.create()
  const issued = new Date(m.dossier.issuedAt)
  doc.setTitle(
    `Trapline dossier: ${m.entry.machine.name}, attempt ${m.dossier.attempt}, version ${m.dossier.version}`,
  )
  doc.setAuthor('Trapline')
  doc.setProducer('Trapline')
  doc.setCreator('Trapline')
  doc.setCreationDate(issued)
  doc.setModificationDate(issued)
  const fonts = await loadFonts(doc)
  const L = new PdfLayout(
    doc,
    fonts,
    `${m.event.name} · attempt #${m.dossier.attempt} · dossier version ${m.dossier.version} · sealed ${m.dossier.issuedAt.slice(0, 10)}`,
  )
  const kmh = m.result.kmh ?? '—'

  // Cover
  L.y -= 60
  L.text('SPEED RECORD DOSSIER', { size: 10, bold: true, color: 'grey' })
  L.heading(`${m.entry.machine.name}`, 26)
  L.text(`Rider ${m.entry.rider.name} · ${m.entry.teamName}`, { size: 13 })
  L.text(`${m.entry.className} · ${m.course.distance.label} (${m.course.distance.nominalM} m)`, {
    size: 13,
    gap: 20,
  })
  L.heading(`${kmh} km/h`, 34)
  L.text(
    `${m.result.mph ?? '—'} mph · distance over the mean of the two times, ${m.profile.figures.value.rounding === 'truncate' ? 'truncated' : 'rounded'} to ${m.profile.figures.value.decimals} decimals`,
    { size: 11, gap: 16 },
  )
  L.pairs([
    ['Event', `${m.event.name}, ${m.event.venue}`],
    ['Rule profile', `${m.profile.name}, version ${m.profile.version}`],
    ['Time window', `${m.result.window?.ok ? 'within' : 'NOT within'}: ${m.result.window?.rule ?? ''}`],
    [
      'Standing record',
      m.result.standingRecordKmh
        ? `${m.result.standingRecordKmh} km/h; ${m.result.beatsRecord ? 'beaten' : 'not beaten'}${m.result.required ? ` (at least ${m.result.required.figure} ${m.result.required.unit} needed)` : ''}`
        : 'none in the book',
    ],
    ['Dossier', `version ${m.dossier.version}, sealed ${m.dossier.issuedAt.replace('T', ' ').slice(0, 19)} UTC`],
    ['Manifest SHA-256', seal.sha256],
  ])
  L.text(
    'The sanctioning body decides on ratification under its current rulebook. Trapline records and computes; it does not certify safety.',
    { color: 'grey' },
  )

  // Computation sheet
  L.newPage().heading('Computation sheet')
  const d = m.course.distance
  for (const run of m.runs) {
    L.text(
      `Run #${run.id}, ${run.direction}, started ${run.startedAt.replace('T', ' ').slice(0, 19)} UTC${run.status === 'aborted' ? `, aborted: ${run.abortedReason}` : ''}${run.counted ? '' : ' (not counted)'}`,
      { bold: true },
    )
    L.table(
      [
        { title: 'Trap', width: 60 },
        { title: 'System', width: 110 },
        { title: 'Time of day', width: 95, align: 'right' },
        { title: 'State', width: 230 },
      ],
      run.readings.map(g => [
        g.trap ?? '',
        g.system,
        g.time,
        g.current ? (g.supersedes ? `correction of #${g.supersedes}: ${g.reason}` : 'as entered') : 'superseded',
      ]),
    )
    if (run.official) {
      L.text(
        `Time over the ${d.label.toLowerCase()}: t = time at ${run.direction === 'out' ? d.exit : d.entry} − time at ${run.direction === 'out' ? d.entry : d.exit} = ${run.official.timeS} s`,
        { indent: 10 },
      )
      L.text(
        `Speed: v = d / t = ${d.nominalM} m / ${run.official.timeS} s = ${run.official.kmh} km/h = ${run.official.mph} mph (computed exactly, then ${m.profile.figures.value.rounding === 'truncate' ? 'truncated' : 'rounded'})`,
        { indent: 10 },
      )
    }
    for (const c of run.crossChecks)
      L.text(
        `Cross-check, ${c.label}: primary and backup differ by ${c.differenceS} s; tolerance ${c.toleranceS} s: ${c.ok ? 'agree' : 'DISAGREE'}`,
        { indent: 10, color: 'grey' },
      )
    L.y -= 6
  }
  if (m.result.kmh) {
    L.text('Result', { bold: true })
    L.text(`Mean time = (t1 + t2) / 2 = ${m.result.meanTimeS} s`, { indent: 10 })
    L.text(
      `v = d / mean time = ${d.nominalM} m / ${m.result.meanTimeS} s = ${m.result.kmh} km/h = ${m.result.mph} mph. 1 km/h = 1/3.6 m/s; 1 mph = 0.44704 m/s exactly; 1 mile = 1609.344 m (NIST SP 811, appendix B).`,
      { indent: 10, gap: 10 },
    )
  }
  for (const f of m.result.findings) L.text(`Finding ${f.code}: ${f.message}`, { color: 'grey' })
  L.heading('Rule profile in force', 12)
  L.table(
    [
      { title: 'Rule', width: 110 },
      { title: 'Value', width: 150 },
      { title: 'Source', width: 235 },
    ],
    (Object.keys(ruleLabels) as (keyof typeof ruleLabels)[]).map(k => [
      ruleLabels[k],
      describeRuleValue(k, m.profile[k].value),
      `${m.profile[k].source} (${m.profile[k].certainty})`,
    ]),
  )

  // Timing sheet
  L.heading('Signed timing sheet')
  L.table(
    [
      { title: 'Act', width: 90 },
      { title: 'By', width: 100 },
      { title: 'When (UTC)', width: 100 },
      { title: 'SHA-256 of the sheet / reason', width: 205 },
    ],
    m.timingSheet.map(s => [
      s.kind === 'timing-sheet' ? 'Signed' : 'Reopened',
      s.typedName,
      s.at.replace('T', ' ').slice(0, 19),
      s.reason ? `${s.sha256} — ${s.reason}` : s.sha256,
    ]),
  )

  // Course and timing
  L.heading('Course, traps and survey')
  L.text(
    `${m.course.name}: heading ${m.course.headingDeg}°, survey tolerance ${m.course.surveyToleranceMm} mm. Measured distance ${d.label} from ${d.entry} to ${d.exit}, nominal ${d.nominalM} m.`,
  )
  L.table(
    [
      { title: 'Trap', width: 100 },
      { title: 'Position from start (m)', width: 160, align: 'right' },
      { title: 'Elevation (m)', width: 120, align: 'right' },
    ],
    m.course.traps.map(t => [t.label, t.positionM, t.elevationM]),
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

  // Inspection
  L.heading('Technical inspection')
  L.text(CHECKLIST_CAUTION, { color: 'grey' })
  if (m.inspection) {
    L.text(
      `Inspection #${m.inspection.id}, checklist ${m.inspection.checklist.name} v${m.inspection.checklist.version}; bus ${m.inspection.bus.voltageV ?? '—'} V ${m.inspection.bus.kind?.toUpperCase() ?? ''}; ${m.inspection.clearance.cleared ? 'cleared to run' : `not cleared: ${m.inspection.clearance.why}`}.`,
    )
    L.table(
      [
        { title: 'Item', width: 230 },
        { title: 'Result', width: 80 },
        { title: 'Measured', width: 90 },
        { title: 'Note', width: 95 },
      ],
      m.inspection.answers.map(a => [a.item, a.result, a.enteredAs ?? '', a.note ?? '']),
    )
    if (m.inspection.signature)
      L.text(
        `Signed by ${m.inspection.signature.typedName}, ${m.inspection.signature.at.replace('T', ' ').slice(0, 19)} UTC; SHA-256 ${m.inspection.signature.sha256}`,
      )
  }

  // Weather
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
    m.runs.map(x => [
      `#${x.id} ${x.direction}`,
      x.weather ? `${x.weather.windSpeedMs} m/s from ${x.weather.windFromDeg}°` : 'not recorded',
      x.wind ? `${x.wind.headingDeg}°` : '',
      x.wind ? `${x.wind.headMs.toFixed(2)} m/s` : '',
      x.wind ? `${Math.abs(x.wind.crossMs).toFixed(2)} m/s` : '',
      x.weather ? `${x.weather.temperatureC ?? '—'} °C, ${x.weather.pressureHpa ?? '—'} hPa` : '',
    ]),
  )

  // Statements
  L.heading('Witness statements')
  for (const s of m.statements) {
    if (s.withdraws) {
      L.text(
        `Statement #${s.id} withdraws #${s.withdraws}: ${s.reason}. Signed ${s.typedName}, ${s.signedAt.slice(0, 19).replace('T', ' ')} UTC.`,
        { bold: true },
      )
      continue
    }
    L.text(`Statement #${s.id} by ${s.typedName}${s.withdrawnBy ? ` (withdrawn by #${s.withdrawnBy})` : ''}`, {
      bold: true,
      gap: 1,
    })
    L.text(
      `Runs seen: ${s.runsSeen}. Watched from: ${s.position}. Conditions: ${s.conditions}. Irregularities: ${s.irregularities || 'none'}.`,
      { indent: 10, gap: 1 },
    )
    L.text(`Signed ${s.signedAt.slice(0, 19).replace('T', ' ')} UTC; SHA-256 ${s.sha256}`, {
      indent: 10,
      color: 'grey',
    })
  }

  // Evidence
  L.heading('Evidence manifest')
  const attached = new Set(attach.map(a => a.sha256))
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
      attached.has(e.sha256) ? 'attached' : 'by hash',
    ]),
    { size: 7.5 },
  )

  // Corrections
  L.heading('Log of corrections')
  const corrections = m.runs.flatMap(x =>
    x.readings
      .filter(g => g.supersedes)
      .map(g => [
        `#${x.id}`,
        g.trap ?? '',
        g.system,
        `${g.time} replaces #${g.supersedes}`,
        `${g.enteredBy}, ${g.enteredAt.slice(0, 19).replace('T', ' ')}: ${g.reason}`,
      ]),
  )
  if (corrections.length)
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
  else L.text('No reading was corrected.')
  for (const s of m.timingSheet.filter(t => t.kind !== 'timing-sheet'))
    L.text(`Timing sheet reopened by ${s.typedName}, ${s.at.slice(0, 19).replace('T', ' ')} UTC: ${s.reason}`)

  // Cautions
  L.heading('Cautions')
  L.text(
    'Speed-record attempts can hurt people. The sanctioning body\'s current rulebook decides; the chief scrutineer decides whether a machine may run; work on high-voltage systems follows qualified high-voltage practice. Trapline records what happened on the course and computes the figures by the rule profile above; it does not certify that a machine, a rider\'s kit or a course is safe. Rule values marked "from memory", "not settled" or "not known" must be checked against the rulebook in force.',
  )

  // Seal
  L.newPage().heading('Seal')
  L.text(
    'This dossier carries its manifest (manifest.json, canonical JSON) and the manifest\'s Ed25519 signature over its SHA-256 (manifest.sig) as attached files, with the evidence files small enough to travel inside. Drop the PDF on the verification page to check the seal, every attached file and whether this file is byte for byte the one issued.',
    { gap: 10 },
  )
  L.pairs([
    ['Manifest SHA-256', seal.sha256],
    ['Key fingerprint', seal.fingerprint],
    ['Verification', seal.verifyUrl],
    ['Seal (Ed25519, base64)', seal.signature],
  ])
  const qr = await doc.embedPng(
    await QRCode.toBuffer(seal.verifyUrl, { type: 'png', margin: 1, width: 300, errorCorrectionLevel: 'M' }),
  )
  L.ensure(170)
  L.page.drawImage(qr, { x: 50, y: L.y - 160, width: 160, height: 160 })
  L.y -= 170
  L.finish()

  const when = { creationDate: issued, modificationDate: issued }
  await doc.attach(new TextEncoder().encode(canonicalJson(m)), 'manifest.json', {
    mimeType: 'application/json',
    description: 'Canonical manifest',
    ...when,
  })
  await doc.attach(new TextEncoder().encode(`${seal.signature}\n`), 'manifest.sig', {
    mimeType: 'text/plain',
    description: `Ed25519 seal of the manifest SHA-256; key ${seal.fingerprint}`,
    ...when,
  })
  for (const a of attach)
    await doc.attach(a.bytes, attachmentName(a.sha256, a.name), {
      mimeType: a.mediaType,
      description: `SHA-256 ${a.sha256}`,
      ...when,
    })
  // Attached files are compressed when the PDF is saved; Node's native zlib does in a fraction of a
  // second what pdf-lib's JavaScript deflate takes seconds for on 20 MB. Same Flate stream format.
  const context = doc.context as unknown as {
    flateStream: (c: Uint8Array, d?: object) => unknown
    stream: (c: Uint8Array, d: object) => unknown
  }
  context.flateStream = (contents, dict = {}) =>
    context.stream(deflateSync(contents), { ...dict, Filter: 'FlateDecode' })
  return doc.save({ useObjectStreams: false })
}

export const attachmentName = (sha: string, name: string) => `${sha.slice(0, 12)}-${name}`

/** Issues a new sealed dossier version for a ready attempt; refuses naming what is missing. */
export async function issueDossier(eventId: number, attemptId: number, userId: number) {
  await attemptOfEvent(eventId, attemptId)
  const r = await readinessOf(eventId, attemptId)
  if (!r.ready) {
    const missing = r.items.filter(i => !i.met)
    throw createError({
      statusCode: 422,
      statusMessage: 'Not ready',
      message: `not ready: ${missing.map(i => i.label).join('; ')}`,
      data: { issues: missing.map(i => ({ path: i.key, message: `${i.label}: ${i.detail}` })) },
    })
  }
  const [previous] = await useDb()
    .select()
    .from(tables.dossiers)
    .where(eq(tables.dossiers.attemptId, attemptId))
    .orderBy(desc(tables.dossiers.version))
    .limit(1)
  const version = (previous?.version ?? 0) + 1
  const issuedAt = new Date()
  const manifest = await buildManifest(r, version, issuedAt)
  const manifestSha = sha256Hex(canonicalJson(manifest))
  const key = useSealKey()
  const seal = sealDigest(manifestSha)
  const verifyUrl = `${useRuntimeConfig().siteUrl.replace(/\/$/, '')}/verify`

  // Small files travel inside, up to the configured total; the rest is referenced by hash only,
  // and no stored file is read again to hash it: the hashes come from their rows.
  const budget = Number(useRuntimeConfig().dossierAttachBytes)
  let used = 0
  const attach: { name: string, bytes: Uint8Array, mediaType: string, sha256: string }[] = []
  const seen = new Set<string>()
  for (const e of [...manifest.evidence].sort((a, b) => Number(a.size) - Number(b.size))) {
    if (seen.has(e.sha256) || used + Number(e.size) > budget) continue
    seen.add(e.sha256)
    const chunks: Buffer[] = []
    for await (const c of await useBlobStore().open(e.sha256)) chunks.push(c as Buffer)
    attach.push({ name: e.name, bytes: Buffer.concat(chunks), mediaType: e.mediaType, sha256: e.sha256 })
    used += Number(e.size)
  }
  const pdf = await renderDossier(
    manifest,
    { sha256: manifestSha, signature: seal, fingerprint: key.fingerprint, verifyUrl },
    attach,
  )
  const pdfSha = sha256Hex(pdf)
  const tmp = join(uploadTmpDir(), `${randomUUID()}.pdf`)
  await import('node:fs/promises').then(fs => fs.mkdir(uploadTmpDir(), { recursive: true }))
  await writeFile(tmp, pdf)
  return useDb().transaction(async (tx) => {
    await tx.execute(sqlLock(pdfSha))
    await useBlobStore().put(pdfSha, tmp, pdf.length, 'application/pdf')
    const [row] = await tx
      .insert(tables.dossiers)
      .values({
        eventId,
        attemptId,
        version,
        manifest,
        manifestSha256: manifestSha,
        seal,
        keyFingerprint: key.fingerprint,
        pdfSha256: pdfSha,
        pdfSize: pdf.length,
        supersedesId: previous?.id ?? null,
        createdBy: userId,
      })
      .returning()
    return row!
  })
}

export async function latestDossier(attemptId: number) {
  const [row] = await useDb()
    .select()
    .from(tables.dossiers)
    .where(eq(tables.dossiers.attemptId, attemptId))
    .orderBy(desc(tables.dossiers.version))
    .limit(1)
  return row ?? null
}

const sqlLock = (sha: string) => sql`select pg_advisory_xact_lock(hashtextextended(${sha}, 0))`
