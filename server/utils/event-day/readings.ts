import { eq, sql } from 'drizzle-orm'
import { parseTimeOfDay } from '#shared/rules/timing'
import type { ReadingInput, CorrectionInput } from '#shared/schemas/event-day'

/** The run with its event's trap and timing-system ids, to refuse a reading for another course. */
async function runContext(tx: Tx, runId: number) {
  const { rows } = await tx.execute<{
    attempt_id: number
    status: string
    event_id: number
    course_id: number
  }>(sql`
    select r.attempt_id, r.status, r.event_id, d.course_id
    from runs r join attempts a on a.id = r.attempt_id join entries e on e.id = a.entry_id
    join measured_distances d on d.id = e.distance_id where r.id = ${runId}`)
  if (!rows[0]) throw notFound('No such run')
  return rows[0]
}

function ticksOf(time: string, ticksPerSecond: number, field: string) {
  try {
    return parseTimeOfDay(time, BigInt(ticksPerSecond))
  }
  catch (e) {
    throw fieldInvalid(field, (e as Error).message)
  }
}

async function checkTrapAndSystem(
  tx: Tx,
  ctx: { event_id: number, course_id: number },
  trapId: number,
  systemId: number,
) {
  const { rows } = await tx.execute<{ trap: number | null, tps: number | null }>(sql`
    select (select id from traps where id = ${trapId} and course_id = ${ctx.course_id}) as trap,
           (select ticks_per_second from timing_systems where id = ${systemId} and event_id = ${ctx.event_id}) as tps`)
  const issues = []
  if (!rows[0]?.trap) issues.push({ path: 'trapId', message: 'is not a trap of this run\'s course' })
  if (!rows[0]?.tps) issues.push({ path: 'systemId', message: 'is not a timing system of this event' })
  if (issues.length) throw fieldsInvalid(issues)
  return rows[0]!.tps!
}

async function assertWritable(tx: Tx, ctx: { attempt_id: number, status: string }) {
  const { signed } = await lockAttempt(tx, ctx.attempt_id)
  if (signed)
    throw conflict('The timing sheet of this attempt is signed; reopen it with a reason before changing readings')
  if (ctx.status === 'aborted') throw conflict('This run was aborted; its readings are kept as they are')
}

/** A first reading of a trap by a timing system. A second one for the same trap is a correction. */
export async function enterReading(
  runId: number,
  input: ReadingInput,
  userId: number,
) {
  return useDb().transaction(async (tx) => {
    const ctx = await runContext(tx, runId)
    const tps = await checkTrapAndSystem(tx, ctx, input.trapId, input.systemId)
    await assertWritable(tx, ctx)
    const ticks = ticksOf(input.time, tps, 'time')
    const inserted = await tx
      .insert(tables.readings)
      .values({ runId, trapId: input.trapId, systemId: input.systemId, ticks, enteredBy: userId })
      .onConflictDoNothing()
      .returning({ id: tables.readings.id })
    if (!inserted.length) {
      const current = await currentReading(tx, runId, input.trapId, input.systemId)
      throw conflict('This trap already has a time from this system; correct it with a reason instead', { current })
    }
    return { id: inserted[0]!.id }
  })
}

async function currentReading(tx: Tx, runId: number, trapId: number, systemId: number) {
  const { rows } = await tx.execute<{ id: number, ticks: string }>(sql`
    select id, ticks::text from readings x where run_id = ${runId} and trap_id = ${trapId} and system_id = ${systemId}
    and not exists (select 1 from readings s where s.supersedes_id = x.id)`)
  return rows[0] ?? null
}

/** A correction is a new reading that supersedes the current one; the one it names must still be current. */
export async function correctReading(
  readingId: number,
  input: CorrectionInput,
  userId: number,
) {
  return useDb().transaction(async (tx) => {
    const [old] = await tx.select().from(tables.readings).where(eq(tables.readings.id, readingId))
    if (!old) throw notFound('No such reading')
    const ctx = await runContext(tx, old.runId)
    const tps = await checkTrapAndSystem(tx, ctx, old.trapId, old.systemId)
    await assertWritable(tx, ctx)
    const current = await currentReading(tx, old.runId, old.trapId, old.systemId)
    if (!current || Number(current.id) !== input.expectedCurrentId || Number(current.id) !== readingId) {
      throw conflict('Someone corrected this time first; here is the current value', { current })
    }
    const ticks = ticksOf(input.time, tps, 'time')
    const inserted = await tx
      .insert(tables.readings)
      .values({
        runId: old.runId,
        trapId: old.trapId,
        systemId: old.systemId,
        ticks,
        supersedesId: readingId,
        reason: input.reason,
        enteredBy: userId,
      })
      .onConflictDoNothing()
      .returning({ id: tables.readings.id })
    if (!inserted.length)
      throw conflict('Someone corrected this time first; here is the current value', {
        current: await currentReading(tx, old.runId, old.trapId, old.systemId),
      })
    return { id: inserted[0]!.id }
  })
}
