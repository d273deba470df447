import { and, asc, desc, eq, getTableColumns, inArray, isNull, sql } from 'drizzle-orm'

/** Entries with their team's name, machine and rider. */
function entryRows(eventId: number) {
  const t = tables
  return useDb()
    .select({ entry: t.entries, teamName: t.teams.name, machine: t.machines, rider: t.riders })
    .from(t.entries)
    .innerJoin(t.teams, eq(t.teams.id, t.entries.teamId))
    .innerJoin(t.machines, eq(t.machines.id, t.entries.machineId))
    .innerJoin(t.riders, eq(t.riders.id, t.entries.riderId))
    .where(eq(t.entries.eventId, eventId))
    .orderBy(asc(t.entries.id))
}

/** The event's readings, each marked current or superseded; superseded ones only with the history. */
function readingRows(eventId: number, history: boolean) {
  const t = tables
  const current = sql<boolean>`not exists (select 1 from readings s where s.supersedes_id = ${t.readings.id})`
  return useDb()
    .select({
      id: t.readings.id,
      runId: t.readings.runId,
      trapId: t.readings.trapId,
      systemId: t.readings.systemId,
      ticks: t.readings.ticks,
      supersedesId: t.readings.supersedesId,
      reason: t.readings.reason,
      sourceEvidenceId: t.readings.sourceEvidenceId,
      enteredAt: t.readings.enteredAt,
      enteredBy: t.users.name,
      current,
    })
    .from(t.readings)
    .innerJoin(t.runs, eq(t.runs.id, t.readings.runId))
    .innerJoin(t.users, eq(t.users.id, t.readings.enteredBy))
    .where(history ? eq(t.runs.eventId, eventId) : and(eq(t.runs.eventId, eventId), current))
    .orderBy(asc(t.readings.id))
}

/** The event's standing records, each with the attempt whose ratified dossier set it (if one did). */
function standingRecordRows(eventId: number) {
  const t = tables
  return useDb()
    .select({ ...getTableColumns(t.standingRecords), fromAttemptId: t.dossiers.attemptId })
    .from(t.standingRecords)
    .leftJoin(t.dossiers, eq(t.dossiers.id, t.standingRecords.dossierId))
    // A record from a ratification since revoked no longer stands.
    .leftJoin(t.claimRevocations, eq(t.claimRevocations.dossierId, t.standingRecords.dossierId))
    .where(and(eq(t.standingRecords.eventId, eventId), isNull(t.standingRecords.retiredAt),
      isNull(t.claimRevocations.id)))
    .orderBy(asc(t.standingRecords.id))
}

/** The latest weather entered for each run. */
function latestWeather(eventId: number) {
  const t = tables
  return useDb()
    .selectDistinctOn([t.weather.runId])
    .from(t.weather)
    .innerJoin(t.runs, eq(t.runs.id, t.weather.runId))
    .where(eq(t.runs.eventId, eventId))
    .orderBy(t.weather.runId, desc(t.weather.enteredAt), desc(t.weather.id))
}

/** Every signing and reopening of the event's timing sheets, oldest first, with the signer's name. */
function sheetSignatureRows(eventId: number) {
  const t = tables
  const s = t.signatures
  return useDb()
    .select({
      s: {
        id: s.id,
        kind: s.kind,
        subjectId: s.subjectId,
        typedName: s.typedName,
        signedAt: s.signedAt,
        contentSha256: s.contentSha256,
        reason: s.reason,
        method: s.method,
        signerId: s.signerId,
      },
      signerName: t.users.name,
    })
    .from(s)
    .innerJoin(t.users, eq(t.users.id, s.signerId))
    .where(and(eq(s.eventId, eventId), inArray(s.kind, ['timing-sheet', 'timing-sheet-reopened'])))
    .orderBy(asc(s.id))
}

/**
 * The stewards' set-asides of failing findings, with the names of the stewards who signed each, first signer
 * first: one takes effect once as many have signed as the attempt's profile asks (its stewards' quorum).
 */
function setAsideRows(eventId: number) {
  const t = tables
  return useDb()
    .select({
      id: t.setAsides.id,
      attemptId: t.setAsides.attemptId,
      runId: t.setAsides.runId,
      code: t.setAsides.code,
      finding: t.setAsides.finding,
      reason: t.setAsides.reason,
      signatureId: t.setAsides.signatureId,
      createdAt: t.setAsides.createdAt,
      by: t.users.name,
      signers: sql<string[]>`coalesce((select array_agg(u.name order by s.id) from ${t.signatures} s
        join ${t.users} u on u.id = s.signer_id
        where s.kind = 'set-aside' and s.subject_id = ${t.setAsides.id}), '{}')`,
    })
    .from(t.setAsides)
    .innerJoin(t.users, eq(t.users.id, t.setAsides.officialId))
    .where(eq(t.setAsides.eventId, eventId))
    .orderBy(asc(t.setAsides.id))
}

/** The event's decided protests and appeals, as far as their consequences go (the decision stands or is appealed). */
async function protestRows(eventId: number) {
  const p = tables.protests
  const rows = await useDb().select({
    id: p.id, attemptId: p.attemptId, appealOf: p.appealOf, outcome: p.outcome, decidedAt: p.decidedAt,
    voids: p.voids, voidRunId: p.voidRunId,
  }).from(p).where(eq(p.eventId, eventId)).orderBy(asc(p.id))
  return rows.map(r => ({ ...r, decidedAt: r.decidedAt?.toISOString() ?? null }))
}

/**
 * The figures a class is judged on (mass, engine capacity) of every signed inspection of the event,
 * with the machine it cleared and when it was signed, oldest first.
 */
function inspectedFigureRows(eventId: number) {
  const t = tables
  return useDb()
    .select({
      inspectionId: t.inspections.id,
      machineId: t.entries.machineId,
      division: t.inspections.division,
      signedAt: t.signatures.signedAt,
      itemKey: t.inspectionAnswers.itemKey,
      value: t.inspectionAnswers.value,
    })
    .from(t.inspections)
    .innerJoin(t.entries, eq(t.entries.id, t.inspections.entryId))
    .innerJoin(t.signatures, eq(t.signatures.id, t.inspections.signatureId))
    .leftJoin(t.inspectionAnswers, and(
      eq(t.inspectionAnswers.inspectionId, t.inspections.id),
      inArray(t.inspectionAnswers.itemKey, ['mass', 'engine-capacity']),
    ))
    .where(eq(t.inspections.eventId, eventId))
    .orderBy(asc(t.signatures.signedAt))
}

/** Impound check-ins after qualifying runs. */
function impoundRows(eventId: number) {
  const t = tables
  return useDb()
    .select(getTableColumns(t.impoundCheckIns))
    .from(t.impoundCheckIns)
    .innerJoin(t.attempts, eq(t.attempts.id, t.impoundCheckIns.attemptId))
    .where(eq(t.attempts.eventId, eventId))
}

/**
 * Everything the run sheet and the live results need for one event, in a fixed number of queries
 * whatever the number of runs and readings.
 */
export async function loadEventDay(eventId: number, options: { history?: boolean } = {}) {
  const db = useDb()
  const t = tables
  const [event] = await db.select().from(t.events).where(eq(t.events.id, eventId))
  if (!event) throw notFound('No such event')
  const courseIds = db.select({ id: t.courses.id }).from(t.courses).where(eq(t.courses.eventId, eventId))
  const [courses, traps, distances, systems, entries, records, attempts, runs, readings, weather, signatures,
    setAsides, impounds, inspected, protests] = await Promise.all([
    db.select().from(t.courses).where(eq(t.courses.eventId, eventId)).orderBy(asc(t.courses.id)),
    // Retired set-up items leave the day (nothing that uses them may be retired); their history stays.
    db.select().from(t.traps).where(and(inArray(t.traps.courseId, courseIds), isNull(t.traps.retiredAt)))
      .orderBy(asc(t.traps.positionM)),
    db.select().from(t.measuredDistances)
      .where(and(inArray(t.measuredDistances.courseId, courseIds), isNull(t.measuredDistances.retiredAt)))
      .orderBy(asc(t.measuredDistances.id)),
    db.select().from(t.timingSystems)
      .where(and(eq(t.timingSystems.eventId, eventId), isNull(t.timingSystems.retiredAt)))
      .orderBy(asc(t.timingSystems.role)),
    entryRows(eventId),
    standingRecordRows(eventId),
    db.select().from(t.attempts).where(eq(t.attempts.eventId, eventId)).orderBy(asc(t.attempts.id)),
    db.select().from(t.runs).where(eq(t.runs.eventId, eventId)).orderBy(asc(t.runs.startedAt)),
    readingRows(eventId, !!options.history),
    latestWeather(eventId),
    sheetSignatureRows(eventId),
    setAsideRows(eventId),
    impoundRows(eventId),
    inspectedFigureRows(eventId),
    protestRows(eventId),
  ])
  const day = { event, courses, traps, distances, systems, records, attempts, runs, readings, signatures, entries }
  return { ...day, setAsides, impounds, inspected, protests, weather: weather.map(w => w.weather) }
}

export type EventDay = Awaited<ReturnType<typeof loadEventDay>>

/**
 * The mass and engine capacity an inspection measured (null where it did not), and the streamlining division its
 * scrutineer saw (null on an inspection from before divisions were confirmed), from the day as loaded.
 */
export function inspectedFigures(day: Pick<EventDay, 'inspected'>, inspectionId: number | null) {
  const rows = day.inspected.filter(i => i.inspectionId === inspectionId)
  const figure = (key: string) => rows.find(i => i.itemKey === key)?.value ?? null
  return { massKg: figure('mass'), capacityCm3: figure('engine-capacity'), division: rows[0]?.division ?? null }
}
