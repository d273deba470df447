import { and, eq, ne } from 'drizzle-orm'
import type { AbortInput, WeatherInput } from '#shared/schemas/event-day'

/** The run, locked, with its attempt; a run of a signed timing sheet is not changed. */
async function lockRunOfOpenSheet(tx: Tx, runId: number, what: string) {
  const [run] = await tx.select().from(tables.runs).where(eq(tables.runs.id, runId)).for('update')
  if (!run) throw notFound('No such run')
  await refuseIfSheetSigned(tx, run.attemptId, what)
  return run
}

/** Aborts a run with a reason; its readings are kept as they are. */
export function abortRun(runId: number, input: AbortInput, userId: number) {
  return useDb().transaction(async (tx) => {
    await lockRunOfOpenSheet(tx, runId, 'aborting one of its runs')
    const [run] = await tx
      .update(tables.runs)
      .set({ status: 'aborted', abortedReason: input.reason, abortedBy: userId })
      .where(and(eq(tables.runs.id, runId), ne(tables.runs.status, 'aborted')))
      .returning()
    if (!run) throw conflict('This run is already aborted')
    return run
  })
}

/** A weather reading for a run; the latest one counts. */
export function addWeather(runId: number, input: WeatherInput, userId: number) {
  return useDb().transaction(async (tx) => {
    await lockRunOfOpenSheet(tx, runId, 'adding weather to one of its runs')
    const [row] = await tx.insert(tables.weather).values({ ...input, runId, enteredBy: userId }).returning()
    return row!
  })
}
