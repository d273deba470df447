import { and, asc, desc, eq, inArray, sql } from 'drizzle-orm'

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
  const [courses, traps, distances, systems, entryRows, records, attempts, runs, readings, weather, signatures]
    = await Promise.all([
      db.select().from(t.courses).where(eq(t.courses.eventId, eventId)).orderBy(asc(t.courses.id)),
      db.select().from(t.traps).where(inArray(t.traps.courseId, courseIds)).orderBy(asc(t.traps.positionM)),
      db
        .select()
        .from(t.measuredDistances)
        .where(inArray(t.measuredDistances.courseId, courseIds))
        .orderBy(asc(t.measuredDistances.id)),
      db
        .select()
        .from(t.timingSystems)
        .where(eq(t.timingSystems.eventId, eventId))
        .orderBy(asc(t.timingSystems.role)),
      db
        .select({ entry: t.entries, teamName: t.teams.name, machine: t.machines, rider: t.riders })
        .from(t.entries)
        .innerJoin(t.teams, eq(t.teams.id, t.entries.teamId))
        .innerJoin(t.machines, eq(t.machines.id, t.entries.machineId))
        .innerJoin(t.riders, eq(t.riders.id, t.entries.riderId))
        .where(eq(t.entries.eventId, eventId))
        .orderBy(asc(t.entries.id)),
      db.select().from(t.standingRecords).where(eq(t.standingRecords.eventId, eventId)),
      db.select().from(t.attempts).where(eq(t.attempts.eventId, eventId)).orderBy(asc(t.attempts.id)),
      db.select().from(t.runs).where(eq(t.runs.eventId, eventId)).orderBy(asc(t.runs.startedAt)),
      db
        .select({
          id: t.readings.id,
          runId: t.readings.runId,
          trapId: t.readings.trapId,
          systemId: t.readings.systemId,
          ticks: t.readings.ticks,
          supersedesId: t.readings.supersedesId,
          reason: t.readings.reason,
          enteredAt: t.readings.enteredAt,
          enteredBy: t.users.name,
          current: sql<boolean>`not exists (select 1 from readings s where s.supersedes_id = ${t.readings.id})`,
        })
        .from(t.readings)
        .innerJoin(t.runs, eq(t.runs.id, t.readings.runId))
        .innerJoin(t.users, eq(t.users.id, t.readings.enteredBy))
        .where(
          options.history
            ? eq(t.runs.eventId, eventId)
            : and(
                eq(t.runs.eventId, eventId),
                sql`not exists (select 1 from readings s where s.supersedes_id = ${t.readings.id})`,
              ),
        )
        .orderBy(asc(t.readings.id)),
      db
        .selectDistinctOn([t.weather.runId])
        .from(t.weather)
        .innerJoin(t.runs, eq(t.runs.id, t.weather.runId))
        .where(eq(t.runs.eventId, eventId))
        .orderBy(t.weather.runId, desc(t.weather.enteredAt), desc(t.weather.id)),
      db
        .select({
          s: {
            id: t.signatures.id,
            kind: t.signatures.kind,
            subjectId: t.signatures.subjectId,
            typedName: t.signatures.typedName,
            signedAt: t.signatures.signedAt,
            contentSha256: t.signatures.contentSha256,
            reason: t.signatures.reason,
          },
          signerName: t.users.name,
        })
        .from(t.signatures)
        .innerJoin(t.users, eq(t.users.id, t.signatures.signerId))
        .where(
          and(
            eq(t.signatures.eventId, eventId),
            inArray(t.signatures.kind, ['timing-sheet', 'timing-sheet-reopened']),
          ),
        )
        .orderBy(asc(t.signatures.id)),
    ])
  return {
    event,
    courses,
    traps,
    distances,
    systems,
    records,
    attempts,
    runs,
    readings,
    signatures,
    entries: entryRows,
    weather: weather.map(w => w.weather),
  }
}

export type EventDay = Awaited<ReturnType<typeof loadEventDay>>
