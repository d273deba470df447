import { and, asc, eq, inArray, sql } from 'drizzle-orm'
import type { StatementInput, WithdrawalInput } from '#shared/schemas/inspection'

type StatementRow = typeof tables.statements.$inferSelect

export const statementContent = (s: StatementRow, authorName: string) => ({
  statement: s.id,
  attempt: s.attemptId,
  author: authorName,
  // Added later: present only where runs were ticked, so a statement signed before still hashes as signed.
  ...(s.runIdsSeen.length ? { runIdsSeen: s.runIdsSeen } : {}),
  runsSeen: s.runsSeen,
  position: s.position,
  conditions: s.conditions,
  irregularities: s.irregularities,
  withdraws: s.withdrawsId,
  reason: s.reason,
})

/** Writes and signs a witness statement in one step: the statement exists only signed. */
export async function createStatement(
  eventId: number,
  input: StatementInput,
  user: { id: number, name: string },
) {
  const [attempt] = await useDb()
    .select({ id: tables.attempts.id, teamId: tables.entries.teamId })
    .from(tables.attempts)
    .innerJoin(tables.entries, eq(tables.entries.id, tables.attempts.entryId))
    .where(and(eq(tables.attempts.id, input.attemptId), eq(tables.attempts.eventId, eventId)))
  if (!attempt) throw fieldInvalid('attemptId', 'is not an attempt of this event')
  const { runIdsSeen } = input
  if (runIdsSeen.length) {
    const runs = await useDb().select({ id: tables.runs.id }).from(tables.runs)
      .where(and(eq(tables.runs.attemptId, attempt.id), inArray(tables.runs.id, runIdsSeen)))
    const other = runIdsSeen.filter(r => !runs.some(x => x.id === r))
    const named = other.map(r => `#${r}`).join(', ')
    if (other.length) throw fieldInvalid('runIdsSeen', `${named} is not a run of this attempt`)
  }
  const proof = await signerProof(user.id, input)
  const body = {
    attemptId: input.attemptId,
    runIdsSeen,
    runsSeen: input.runsSeen,
    position: input.position,
    conditions: input.conditions,
    irregularities: input.irregularities,
  }
  return signStatement(eventId, body, user, { ...input, proof }, tx => assertMayWitness(tx, eventId, attempt, user.id))
}

/**
 * A witness is independent of the team and counts once: an official who holds a role in the
 * attempt's team may not witness it, and a second statement on the same attempt is refused while
 * the first stands (withdraw it first). Checked under a lock on the attempt's statements.
 */
async function assertMayWitness(tx: Tx, eventId: number, attempt: { id: number, teamId: number }, userId: number) {
  await tx.execute(sql`select pg_advisory_xact_lock(hashtextextended(${`statements:${attempt.id}`}, 0))`)
  await refuseConflicted(tx, { eventId, userId }, [attempt.teamId], 'witness this team\'s attempt')
  const mine = await tx
    .select({ id: tables.statements.id, withdrawsId: tables.statements.withdrawsId })
    .from(tables.statements)
    .where(and(eq(tables.statements.attemptId, attempt.id), eq(tables.statements.authorId, userId)))
  const withdrawn = new Set(mine.map(m => m.withdrawsId).filter(Boolean))
  const standing = mine.find(m => !m.withdrawsId && !withdrawn.has(m.id))
  if (standing) {
    const message = `You already have a signed statement on this attempt (#${standing.id}); `
      + 'withdraw it to write another'
    throw conflict(message)
  }
}

async function signStatement(
  eventId: number,
  body: Pick<StatementRow, 'attemptId' | 'runsSeen' | 'position' | 'conditions' | 'irregularities'> & {
    runIdsSeen?: number[]
    withdrawsId?: number
    reason?: string
  },
  user: { id: number, name: string },
  sign: { typedName: string, nameNote?: string, drawingPng?: string, proof: SignerProof },
  guard?: (tx: Tx) => Promise<void>,
) {
  return useDb().transaction(async (tx) => {
    await guard?.(tx)
    const [row] = await tx
      .insert(tables.statements)
      .values({ eventId, authorId: user.id, ...body })
      .onConflictDoNothing()
      .returning()
    if (!row) throw conflict('This statement has already been withdrawn')
    const sig = await insertSignature(tx, {
      proof: sign.proof,
      kind: 'statement',
      subjectId: row.id,
      eventId,
      signerId: user.id,
      typedName: sign.typedName,
      nameNote: sign.nameNote,
      content: statementContent(row, user.name),
      drawingPng: sign.drawingPng,
      reason: body.reason,
      supersedesId: null,
    })
    const [signed] = await tx
      .update(tables.statements)
      .set({ signatureId: sig.id })
      .where(eq(tables.statements.id, row.id))
      .returning()
    return { ...signed!, sha256: sig.contentSha256 }
  })
}

/** Withdraws a signed statement by a new signed statement that says why; both are kept. */
export async function withdrawStatement(
  statementId: number,
  input: WithdrawalInput,
  user: { id: number, name: string },
) {
  const [original] = await useDb().select().from(tables.statements).where(eq(tables.statements.id, statementId))
  if (!original) throw notFound('No such statement')
  if (original.authorId !== user.id)
    throw createError({ statusCode: 403, statusMessage: 'Only the official who signed a statement withdraws it' })
  if (original.withdrawsId)
    throw conflict('This is a withdrawal; it cannot itself be withdrawn')
  const proof = await signerProof(user.id, input)
  return signStatement(
    original.eventId,
    {
      attemptId: original.attemptId,
      runsSeen: '',
      position: '',
      conditions: '',
      irregularities: '',
      withdrawsId: original.id,
      reason: input.reason,
    },
    user,
    { ...input, proof },
  )
}

/** Statements at an event; a team sees those on its own attempts only. */
export async function statementsAt(eventId: number, onlyTeamIds: number[] | null) {
  const db = useDb()
  const attemptIds = onlyTeamIds
    ? (
        await db
          .select({ id: tables.attempts.id })
          .from(tables.attempts)
          .innerJoin(tables.entries, eq(tables.entries.id, tables.attempts.entryId))
          .where(
            and(
              eq(tables.attempts.eventId, eventId),
              inArray(tables.entries.teamId, onlyTeamIds.length ? onlyTeamIds : [0]),
            ),
          )
      ).map(a => a.id)
    : null
  const rows = await db
    .select({
      s: tables.statements,
      author: tables.users.name,
      signedAt: tables.signatures.signedAt,
      typedName: tables.signatures.typedName,
      method: tables.signatures.method,
      sha256: tables.signatures.contentSha256,
    })
    .from(tables.statements)
    .innerJoin(tables.users, eq(tables.users.id, tables.statements.authorId))
    .innerJoin(tables.signatures, eq(tables.signatures.id, tables.statements.signatureId))
    .where(
      attemptIds
        ? and(
            eq(tables.statements.eventId, eventId),
            inArray(tables.statements.attemptId, attemptIds.length ? attemptIds : [0]),
          )
        : eq(tables.statements.eventId, eventId),
    )
    .orderBy(asc(tables.statements.id))
  const withdrawn = new Map(rows.filter(r => r.s.withdrawsId).map(r => [r.s.withdrawsId!, r]))
  return rows.map(r => ({
    ...r.s,
    author: r.author,
    signedAt: r.signedAt,
    typedName: r.typedName,
    method: r.method,
    sha256: r.sha256,
    withdrawnBy: withdrawn.get(r.s.id)
      ? {
          id: withdrawn.get(r.s.id)!.s.id,
          reason: withdrawn.get(r.s.id)!.s.reason,
          at: withdrawn.get(r.s.id)!.signedAt,
        }
      : null,
  }))
}
