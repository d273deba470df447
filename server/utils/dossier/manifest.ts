import { eq, inArray } from 'drizzle-orm'
import { formatTimeOfDay } from '#shared/rules/timing'
import { allItems } from '#shared/inspection/evaluate'
import type { Readiness } from './readiness'

export const DOSSIER_FORMAT = 'trapline-dossier/1'

type EventDay = Readiness['day']
type Evidence = typeof tables.evidence.$inferSelect

/** The canonical manifest of a dossier: everything its figures and signatures rest on. */
export async function buildManifest(r: Readiness, version: number, issuedAt: Date) {
  const { day, live } = r
  const attempt = day.attempts.find(a => a.id === r.attemptId)!
  return {
    format: DOSSIER_FORMAT,
    dossier: {
      attempt: r.attemptId,
      version,
      issuedAt: issuedAt.toISOString(),
      copy: 'officials' as 'officials' | 'public',
    },
    event: { id: day.event.id, name: day.event.name, venue: day.event.venue, timeZone: day.event.timeZone },
    entry: manifestEntry(r),
    profile: attempt.profile,
    course: manifestCourse(r),
    timingSystems: day.systems.map(s => ({
      name: s.name,
      role: s.role,
      ticksPerSecond: s.ticksPerSecond,
      toleranceS: s.toleranceS,
      calibratedOn: s.calibratedOn,
      calibrationExpires: s.calibrationExpires,
      description: s.description,
      timeBase: s.timeBase,
      synchronisation: s.synchronisation,
    })),
    runs: manifestRuns(r),
    result: {
      ...live.result,
      window: live.window,
      valid: live.valid,
      beatsRecord: live.beatsRecord,
      standingRecord: live.standingRecord,
      required: live.required,
      findings: live.findings.map(manifestFinding),
      /** Every distance the same passes claim, each with its own dossier: this one and the others. */
      claims: live.distances.map(d => ({
        label: d.label,
        start: d.start,
        nominalM: d.nominalM,
        kmh: d.result?.kmh ?? null,
      })),
    },
    timingSheet: live.sheet.history.map(h => ({
      kind: h.kind,
      method: h.method,
      typedName: h.typedName,
      at: new Date(h.at).toISOString(),
      sha256: h.sha256,
      reason: h.reason,
    })),
    inspections: await manifestInspections(r),
    postRunCheck: await manifestPostRunCheck(r),
    statements: await manifestStatements(day.event.id, r.attemptId),
    notices: await manifestNotices(day.event.id, r.attemptId, issuedAt),
    officials: await manifestOfficials(day.event.id),
    startLine: await manifestStartLine(r, issuedAt),
    protests: await manifestProtests(day.event.id, r.attemptId, issuedAt),
    /** The stewards' confirmation of the result on the timing sheet in force, with the instant it was due from. */
    confirmation: {
      quorum: r.confirmation.quorum,
      after: r.confirmation.afterClock,
      signers: r.confirmation.signers.map(s => ({ name: s.name, at: s.at.toISOString(), sha256: s.sha256 })),
    },
    evidence: r.evidence.filter(e => isForAttempt(e, r)).map(e => ({
      id: e.id,
      kind: e.kind,
      name: e.originalName,
      mediaType: e.mediaType,
      size: e.size,
      sha256: e.sha256,
    })),
  }
}

export type Manifest = Awaited<ReturnType<typeof buildManifest>>

function manifestEntry({ live, entry }: Readiness) {
  const { machine, rider } = entry
  return {
    ...live.entry,
    machine: {
      name: machine.name,
      power: machine.power,
      declaredMassKg: machine.declaredMassKg,
      division: machine.division,
    },
    rider: {
      name: rider.name, licenceNo: rider.licenceNo, licenceExpires: rider.licenceExpires,
      licenceGrade: rider.licenceGrade, medicalExpires: rider.medicalExpires,
    },
  }
}

function manifestCourse({ day, distance }: Readiness) {
  const course = day.courses.find(c => c.id === distance.courseId)!
  const trapLabel = trapLabels(day)
  return {
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
  }
}

/** A finding with the stewards' signed decision that set it aside, if one did. */
const manifestFinding = (f: Readiness['live']['findings'][number]) => ({
  code: f.code,
  severity: f.severity,
  message: f.message,
  setAside: f.setAside ?? null,
})

const trapLabels = (day: EventDay) => new Map(day.traps.map(t => [t.id, t.label]))

function manifestRuns({ day, live, attemptId, evidence }: Readiness) {
  return day.runs.filter(x => x.attemptId === attemptId).map((x) => {
    const lr = live.runs.find(l => l.id === x.id)!
    return {
      id: x.id,
      direction: x.direction,
      startedAt: x.startedAt.toISOString(),
      status: x.status,
      abortedReason: x.abortedReason,
      counted: lr.counted,
      readings: manifestReadings(day, x.id, evidence),
      official: lr.official,
      crossChecks: lr.crossChecks,
      weather: lr.weather,
      wind: lr.wind,
      findings: lr.findings.map(manifestFinding),
    }
  })
}

/** Every reading of a run, superseded ones included, as the timing system's time of day. */
function manifestReadings(day: EventDay, runId: number, evidence: Evidence[]) {
  const trapLabel = trapLabels(day)
  const file = (id: number | null) => evidence.find(e => e.id === id)
  const systems = new Map(day.systems.map(s => [s.id, s]))
  return day.readings.filter(g => g.runId === runId).map((g) => {
    const system = systems.get(g.systemId)!
    return {
      id: g.id,
      trap: trapLabel.get(g.trapId),
      system: system.name,
      time: formatTimeOfDay(g.ticks, BigInt(system.ticksPerSecond)),
      ticks: g.ticks.toString(),
      current: g.current,
      supersedes: g.supersedesId,
      reason: g.reason,
      /** The timing device's own file it was imported from (a data log in the evidence, by its hash). */
      source: g.sourceEvidenceId
        ? { name: file(g.sourceEvidenceId)?.originalName ?? '', sha256: file(g.sourceEvidenceId)?.sha256 ?? '' }
        : null,
      enteredBy: g.enteredBy,
      enteredAt: g.enteredAt.toISOString(),
    }
  })
}

/**
 * The inspections in force when the counted runs started (one, unless the machine was re-inspected
 * between them), each with the runs it covered; before any run, the machine's latest.
 */
async function manifestInspections(r: Pick<Readiness, 'atRuns' | 'clearance'>) {
  const ids = r.atRuns.length ? r.atRuns.map(a => a.inspectionId) : [r.clearance.inspectionId]
  const out = []
  for (const id of [...new Set(ids)].filter((x): x is number => x !== null)) {
    out.push({
      ...(await manifestInspection(id)),
      runs: r.atRuns.filter(a => a.inspectionId === id).map(a => a.runId),
    })
  }
  return out
}

async function manifestInspection(inspectionId: number) {
  const { inspection, clearance, answers, signature } = await inspectionView(inspectionId)
  const { checklist } = inspection
  return {
    id: inspection.id,
    checklist: { id: checklist.id, name: checklist.name, version: checklist.version },
    bus: { voltageV: inspection.busVoltageV, kind: inspection.busKind },
    declaredKmh: inspection.declaredKmh,
    division: inspection.division,
    clearance,
    answers: answers.map((a) => {
      const item = allItems(checklist).find(x => x.key === a.itemKey)
      return {
        item: a.itemKey,
        label: item?.label ?? a.itemKey,
        result: a.result,
        enteredAs: a.enteredAs,
        note: a.note,
        // The measured value's own verdict against its limit, with the limit's source.
        withinLimit: a.verdict.withinLimit,
        check: a.verdict.message,
        limitSource: item?.kind === 'measure' ? item.source : null,
      }
    }),
    signature: signature && {
      method: signature.method,
      typedName: signature.typedName,
      at: new Date(signature.at).toISOString(),
      sha256: signature.sha256,
    },
  }
}

/**
 * The signed check of the machine after the record run where the profile asks for it: the figures re-measured, the
 * seals as found, and readiness's verdict on them (the class re-judged). Null where none was asked or recorded.
 */
async function manifestPostRunCheck({ attemptId, items }: Readiness) {
  const [row] = await useDb()
    .select({ c: tables.postRunChecks, typedName: tables.signatures.typedName, at: tables.signatures.signedAt,
      sha256: tables.signatures.contentSha256 })
    .from(tables.postRunChecks)
    .innerJoin(tables.signatures, eq(tables.signatures.id, tables.postRunChecks.signatureId))
    .where(eq(tables.postRunChecks.attemptId, attemptId))
  const verdict = items.find(i => i.key === 'post-run-check')
  if (!row || !verdict) return null
  const { c } = row
  return {
    massKg: c.massKg,
    capacityCm3: c.capacityCm3,
    sealNumbers: c.sealNumbers,
    sealsIntact: c.sealsIntact,
    note: c.note,
    met: verdict.met,
    detail: verdict.detail,
    signature: { typedName: row.typedName, at: row.at.toISOString(), sha256: row.sha256 },
  }
}

/** The event's permit and the officials appointed (in force at the issue), as the dossier names them. */
async function manifestOfficials(eventId: number) {
  const { permit, appointments } = await officialsOf(eventId)
  return {
    permit: permit
      ? { issuingBody: permit.issuingBody, number: permit.number, validFrom: permit.validFrom, validTo: permit.validTo }
      : null,
    appointments: appointments.filter(a => !a.endedAt)
      .map(a => ({ function: a.function, label: a.label, name: a.name })),
  }
}

/**
 * What the start line rested on: the rider's sign-ons to the event's briefings, each run's expected speed and
 * licence upgrade, and the clerk of the course's signed overrides the runs started under.
 */
async function manifestStartLine(r: Readiness, issuedAt: Date) {
  const { briefings } = await briefingsOf(r.day.event.id)
  // What the fastest official speed of the attempt says at the issue, after its last run: over the rider's grade, the
  // tyres' rating or the parachutes fitted (the same judgement the start line makes before each run).
  const line = (await startLineOf(useDb(), r.day.event, [r.entry], issuedAt, undefined,
    reachedBefore(r.day, [r.live], Number.POSITIVE_INFINITY))).get(r.entry.entry.id)!
  const speedReached = line.findings.filter(f => f.code.startsWith('reached.')).map(f => f.message)
  const riderId = r.entry.rider.id
  const runs = r.day.runs.filter(x => x.attemptId === r.attemptId)
  const overrideIds = [...new Set(runs.flatMap(x => (x.overrideId ? [x.overrideId] : [])))]
  const overrides = overrideIds.length
    ? await useDb().select({ o: tables.startOverrides, typedName: tables.signatures.typedName,
        sha256: tables.signatures.contentSha256 })
        .from(tables.startOverrides)
        .innerJoin(tables.signatures, eq(tables.signatures.id, tables.startOverrides.signatureId))
        .where(inArray(tables.startOverrides.id, overrideIds))
    : []
  return {
    briefings: briefings.map(b => ({
      title: b.title,
      heldAt: b.heldAt.toISOString(),
      signOn: b.signOns.filter(x => x.riderId === riderId).map(x => ({
        name: x.name, onDevice: x.onDevice, at: x.signedAt.toISOString(), sha256: x.sha256,
      }))[0] ?? null,
    })),
    runs: runs.map(x => ({ id: x.id, expectedKmh: x.expectedKmh, licenceUpgrade: x.licenceUpgrade,
      overrideId: x.overrideId })),
    overrides: overrides.map(x => ({ id: x.o.id, day: x.o.day, codes: x.o.codes, reason: x.o.reason,
      clerk: x.typedName, sha256: x.sha256 })),
    speedReached,
  }
}

/** The protests and appeals on the attempt lodged up to the issue, with their hearings and decisions. */
async function manifestProtests(eventId: number, attemptId: number, issuedAt: Date) {
  return (await protestsOf(eventId, [attemptId])).filter(p => p.lodgedAt <= issuedAt).map(p => ({
    id: p.id, appealOf: p.appealOf, kind: p.kind, team: p.team, grounds: p.grounds, lodged: p.lodgedClock,
    deadline: p.deadlineClock, feeNote: p.feeNote, heard: p.heardAt?.toISOString() ?? null, present: p.present,
    hearing: p.hearing, outcome: p.outcome, reasons: p.reasons, decidedBy: p.decidedByName, decided: p.decidedClock,
  }))
}

/** The official notices that concern the attempt: its own, and the event's general ones, up to the issue. */
async function manifestNotices(eventId: number, attemptId: number, issuedAt: Date) {
  const all = await noticesAt(eventId)
  return all.filter(n => (n.attemptId === null || n.attemptId === attemptId) && n.publishedAt <= issuedAt).map(n => ({
    id: n.id,
    attemptId: n.attemptId,
    title: n.title,
    body: n.body,
    issuer: n.issuer,
    typedName: n.typedName,
    at: n.publishedAt.toISOString(),
    sha256: n.sha256,
  }))
}

async function manifestStatements(eventId: number, attemptId: number) {
  const statements = await statementsAt(eventId, null)
  return statements.filter(s => s.attemptId === attemptId).map(s => ({
    id: s.id,
    author: s.author,
    typedName: s.typedName,
    method: s.method,
    signedAt: new Date(s.signedAt).toISOString(),
    sha256: s.sha256,
    runIdsSeen: s.runIdsSeen,
    runsSeen: s.runsSeen,
    position: s.position,
    conditions: s.conditions,
    irregularities: s.irregularities,
    withdraws: s.withdrawsId,
    reason: s.reason,
    withdrawnBy: s.withdrawnBy?.id ?? null,
  }))
}

/**
 * Evidence of the event that belongs in this attempt's file: its own, its entry's, its runs', the
 * course's and the timing systems'.
 */
function isForAttempt(e: Evidence, r: Readiness) {
  const runIds = new Set(r.day.runs.filter(x => x.attemptId === r.attemptId).map(x => x.id))
  return (
    r.day.readings.some(g => g.sourceEvidenceId === e.id && runIds.has(g.runId))
    || e.attemptId === r.attemptId
    || (e.runId !== null && runIds.has(e.runId))
    || e.entryId === r.entry.entry.id
    || e.courseId === r.distance.courseId
    || e.timingSystemId !== null
    || (e.inspectionId !== null
      && (e.inspectionId === r.clearance.inspectionId || r.atRuns.some(a => a.inspectionId === e.inspectionId)))
  )
}

/** Evidence kinds that are personal: attached to the officials' copy only. */
export const PERSONAL_EVIDENCE = new Set(['rider-licence'])

/**
 * The public copy's manifest: every figure, signature and hash as in the officials' copy, without the
 * rider's licence number; personal files are listed by hash but not attached.
 */
export function publicManifest(m: Manifest): Manifest {
  const copy = structuredClone(m)
  copy.dossier.copy = 'public'
  copy.entry.rider = { ...copy.entry.rider, licenceNo: 'withheld in the public copy', medicalExpires: null }
  return copy
}
