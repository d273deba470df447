import { and, eq } from 'drizzle-orm'
import type { PostRunCheckInput } from '#shared/schemas/inspection'

type CheckRow = typeof tables.postRunChecks.$inferSelect

/** What a scrutineer signs in recording the post-run check. */
export const postRunCheckContent = (c: CheckRow, scrutineerName: string) => ({
  postRunCheck: c.id,
  attempt: c.attemptId,
  massKg: c.massKg,
  note: c.note,
  scrutineer: scrutineerName,
})

/**
 * Records the machine's check after its record run, where the attempt's profile asks for it: the mass
 * re-measured, signed, once per attempt (409 after).
 */
export async function recordPostRunCheck(
  eventId: number,
  attemptId: number,
  input: PostRunCheckInput,
  user: { id: number, name: string },
) {
  await refuseConflicted(useDb(), { eventId, userId: user.id }, [await teamOfAttemptIn(useDb(), attemptId)],
    'sign the post-run check of this team\'s attempt')
  const proof = await signerProof(user.id, input)
  return useDb().transaction(async (tx) => {
    const [attempt] = await tx.select().from(tables.attempts)
      .where(and(eq(tables.attempts.id, attemptId), eq(tables.attempts.eventId, eventId)))
      .for('update')
    if (!attempt) throw notFound('No such attempt')
    if (!attempt.profile.postRunCheck?.value) {
      throw conflict('The rule profile of this attempt asks for no post-run check')
    }
    const [row] = await tx.insert(tables.postRunChecks)
      .values({ attemptId, massKg: String(input.massKg), note: input.note, scrutineerId: user.id })
      .onConflictDoNothing()
      .returning()
    if (!row) throw conflict('The post-run check of this attempt is already recorded')
    const sig = await insertSignature(tx, {
      proof,
      kind: 'post-run-check',
      subjectId: row.id,
      eventId,
      signerId: user.id,
      typedName: input.typedName,
      nameNote: input.nameNote,
      content: postRunCheckContent(row, user.name),
    })
    const [signed] = await tx.update(tables.postRunChecks).set({ signatureId: sig.id })
      .where(eq(tables.postRunChecks.id, row.id)).returning()
    return signed!
  })
}
