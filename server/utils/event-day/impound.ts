import { and, eq, ne } from 'drizzle-orm'
import type { ImpoundInput } from '#shared/schemas/event-day'

/**
 * Records the machine's check-in at the impound after the qualifying run of an attempt whose
 * profile has one: once (409 after), at the server's clock unless an instant is given, never before
 * the qualifying run started.
 */
export function checkIntoImpound(eventId: number, attemptId: number, input: ImpoundInput, userId: number) {
  return useDb().transaction(async (tx) => {
    const [attempt] = await tx.select().from(tables.attempts)
      .where(and(eq(tables.attempts.id, attemptId), eq(tables.attempts.eventId, eventId)))
      .for('update')
    if (!attempt) throw notFound('No such attempt')
    if (!attempt.profile.qualifying?.value) {
      throw conflict('The rule profile of this attempt has no qualifying run and no impound after it')
    }
    const [qualifier] = await tx.select().from(tables.runs)
      .where(and(eq(tables.runs.attemptId, attemptId), ne(tables.runs.status, 'aborted')))
      .orderBy(tables.runs.startedAt)
      .limit(1)
    if (!qualifier) throw conflict('This attempt has no qualifying run yet')
    const checkedInAt = input.checkedInAt ? new Date(input.checkedInAt) : new Date()
    if (checkedInAt < qualifier.startedAt) {
      throw fieldInvalid('checkedInAt', 'is before the qualifying run started')
    }
    const [row] = await tx.insert(tables.impoundCheckIns)
      .values({ attemptId, checkedInAt, note: input.note, recordedBy: userId })
      .onConflictDoNothing()
      .returning()
    if (!row) throw conflict('The impound check-in of this attempt is already recorded')
    return row
  })
}
