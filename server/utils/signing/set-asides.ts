import { and, eq } from 'drizzle-orm'
import { mayBeSetAside } from '#shared/rules/findings'
import type { SetAsideInput } from '#shared/schemas/inspection'

type SetAsideRow = typeof tables.setAsides.$inferSelect

/** What an official signs in setting a finding aside. */
export const setAsideContent = (s: SetAsideRow, officialName: string) => ({
  setAside: s.id,
  attempt: s.attemptId,
  run: s.runId,
  code: s.code,
  finding: s.finding,
  reason: s.reason,
  official: officialName,
})

/**
 * The finding as the live results give it now: of the attempt, or of one of its counted runs, over any
 * distance the attempt claims (the first where it stands).
 */
async function currentFinding(eventId: number, attemptId: number, input: SetAsideInput) {
  const day = await loadEventDay(eventId)
  const attempt = day.attempts.find(a => a.id === attemptId)
  if (!attempt) throw notFound('No such attempt')
  const first = computeLive({ ...day, attempts: [attempt] })[0]!
  const views = [first, ...first.distances.slice(1)
    .map(d => computeLive({ ...day, attempts: [attempt] }, { distanceId: d.distanceId })[0]!)]
  const found = views.map((live) => {
    const run = input.runId === null ? null : live.runs.find(r => r.id === input.runId && r.counted)
    const findings = run ? run.findings : input.runId === null ? live.findings : []
    return { live, run, finding: findings.find(f => f.code === input.code) }
  })
  if (input.runId !== null && !found.some(x => x.run)) {
    throw fieldInvalid('runId', 'is not a counted run of this attempt')
  }
  const { finding, live } = found.find(x => x.finding) ?? { finding: undefined, live: first }
  const where = input.runId === null ? 'attempt' : 'run'
  if (!finding) throw fieldInvalid('code', `is not a finding of this ${where} now`)
  if (!mayBeSetAside(finding)) {
    throw fieldInvalid('code', 'cannot be set aside: only a failing finding about how the runs were made or '
      + 'measured can be, never whether the result beats the record')
  }
  if (finding.setAside) throw conflict(`This finding was already set aside by ${finding.setAside.by}`)
  return { finding, teamId: live.entry.teamId }
}

/**
 * An official sets a failing finding aside with a written reason, signed with the password: the
 * decision is kept with the finding's words, printed in the dossier beside it, and never edited.
 * Checked under a lock on the attempt, so the same finding is set aside once.
 */
export async function setAsideFinding(
  eventId: number,
  attemptId: number,
  input: SetAsideInput,
  user: { id: number, name: string },
) {
  const proof = await signerProof(user.id, input)
  return useDb().transaction(async (tx) => {
    await tx.select({ id: tables.attempts.id }).from(tables.attempts)
      .where(and(eq(tables.attempts.id, attemptId), eq(tables.attempts.eventId, eventId)))
      .for('update')
    const { finding, teamId } = await currentFinding(eventId, attemptId, input)
    const inTeam = await tx.select({ id: tables.memberships.id }).from(tables.memberships).where(and(
      eq(tables.memberships.eventId, eventId),
      eq(tables.memberships.userId, user.id),
      eq(tables.memberships.teamId, teamId),
    ))
    if (inTeam.length) {
      throw conflict('An official who holds a role in the attempt\'s team cannot decide on its findings')
    }
    const [row] = await tx.insert(tables.setAsides).values({
      eventId,
      attemptId,
      runId: input.runId,
      code: finding.code,
      finding: finding.message,
      reason: input.reason,
      officialId: user.id,
    }).returning()
    const signature = await insertSignature(tx, {
      proof,
      kind: 'set-aside',
      subjectId: row!.id,
      eventId,
      signerId: user.id,
      typedName: input.typedName,
      nameNote: input.nameNote,
      content: setAsideContent(row!, user.name),
    })
    const [signed] = await tx.update(tables.setAsides).set({ signatureId: signature.id })
      .where(eq(tables.setAsides.id, row!.id)).returning()
    return signed!
  })
}
