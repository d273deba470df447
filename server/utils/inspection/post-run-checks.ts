import { and, eq } from 'drizzle-orm'
import { classesOf, findClass } from '#shared/rules/classes'
import type { PostRunCheckInput } from '#shared/schemas/inspection'

type CheckRow = typeof tables.postRunChecks.$inferSelect

/** What a scrutineer signs in recording the post-run check. */
// Figures added later appear only where they were recorded, so a check signed before them still hashes as signed.
export const postRunCheckContent = (c: CheckRow, scrutineerName: string) => ({
  postRunCheck: c.id,
  attempt: c.attemptId,
  massKg: c.massKg,
  ...(c.capacityCm3 === null ? {} : { capacityCm3: c.capacityCm3 }),
  ...(c.sealNumbers.length ? { sealNumbers: c.sealNumbers, sealsIntact: c.sealsIntact } : {}),
  note: c.note,
  scrutineer: scrutineerName,
})

/**
 * What the form must give beyond its schema: the capacity where the attempt's class goes by capacity (the class is
 * re-judged on it), and whether the seals were intact where seal numbers are given.
 */
function refuseMissingFigures(input: PostRunCheckInput, byCapacity: boolean) {
  if (byCapacity && input.capacityCm3 === undefined)
    throw fieldInvalid('capacityCm3', 'is required: the class goes by engine capacity, re-measured after the run')
  if (input.sealNumbers.length && input.sealsIntact === undefined)
    throw fieldInvalid('sealsIntact', 'say whether every seal was found intact')
}

/**
 * Records the machine's check after its record run, where the attempt's profile asks for it: the mass
 * re-measured, the capacity where the class goes by it, the impound seals as found; signed, once per attempt (409
 * after).
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
    const [entry] = await tx.select({ className: tables.entries.className }).from(tables.entries)
      .where(eq(tables.entries.id, attempt.entryId))
    refuseMissingFigures(input, !!findClass(classesOf(attempt.profile), entry!.className)?.capacityCm3)
    const [row] = await tx.insert(tables.postRunChecks)
      .values({
        attemptId,
        massKg: String(input.massKg),
        capacityCm3: input.capacityCm3 === undefined ? null : input.capacityCm3.toFixed(2),
        sealNumbers: input.sealNumbers,
        sealsIntact: input.sealNumbers.length ? input.sealsIntact! : null,
        note: input.note,
        scrutineerId: user.id,
      })
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
