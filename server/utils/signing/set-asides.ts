import { and, eq, isNull } from 'drizzle-orm'
import { setAsideQuorum, setAsideRule } from '#shared/rules/findings'
import { stewardsQuorum } from '#shared/rules/profile'
import type { SignSheetInput } from '#shared/schemas/event-day'
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
  const rule = setAsideRule(finding.code)
  if (finding.severity !== 'fail') throw fieldInvalid('code', 'is not a failing finding: it blocks nothing')
  if (rule.authority === 'never') throw fieldInvalid('code', `can never be set aside: ${rule.why} (${rule.source})`)
  if (finding.setAside) throw conflict(`This finding was already set aside by ${finding.setAside.by}`)
  return { finding, teamId: live.entry.teamId }
}

/** The words of the steward's gate for a set-aside. */
const SET_ASIDE_ACT = { signs: 'a set-aside', conflicted: 'set aside a finding of this team\'s attempt' }

/**
 * Who signs a set-aside of this finding, asked before the password: the appointed chief timekeeper for a gap in the
 * timing evidence, else an appointed steward; never one of the attempt's team.
 */
async function refuseUnlessEntitled(eventId: number, userId: number, attemptId: number, code: string) {
  if (setAsideRule(code).authority !== 'chief-timekeeper') {
    return refuseUnlessIndependentSteward(eventId, userId, attemptId, SET_ASIDE_ACT)
  }
  if (!(await holdsAppointment(eventId, userId, 'chief-timekeeper'))) {
    throw forbidden('Only the chief timekeeper appointed at this event writes why a run was timed by one system only')
  }
  await refuseConflicted(useDb(), { eventId, userId }, [await teamOfAttemptIn(useDb(), attemptId)],
    SET_ASIDE_ACT.conflicted)
}

/** The set-aside's signers so far and how many the attempt's profile asks for. */
async function signersOf(tx: Tx, setAsideId: number) {
  return tx.select({ signerId: tables.signatures.signerId }).from(tables.signatures)
    .where(and(eq(tables.signatures.kind, 'set-aside'), eq(tables.signatures.subjectId, setAsideId)))
}

const quorumOf = async (tx: Tx, attemptId: number, code: string) => {
  const [a] = await tx.select({ profile: tables.attempts.profile }).from(tables.attempts)
    .where(eq(tables.attempts.id, attemptId))
  return setAsideQuorum(code, stewardsQuorum(a!.profile))
}

/**
 * A steward proposes setting a failing finding aside with a written reason, signed: a decision of the stewards that
 * takes effect once the profile's quorum of appointed stewards has signed it (see cosignSetAside), then printed in
 * the dossier beside the finding with every name, and never edited. Only a finding the rules let the stewards set
 * aside; never by a steward of the attempt's team. Checked under a lock on the attempt, so one decision per finding.
 */
export async function setAsideFinding(
  eventId: number,
  attemptId: number,
  input: SetAsideInput,
  user: { id: number, name: string },
) {
  await refuseUnlessEntitled(eventId, user.id, attemptId, input.code)
  const proof = await signerProof(user.id, input)
  return useDb().transaction(async (tx) => {
    await tx.select({ id: tables.attempts.id }).from(tables.attempts)
      .where(and(eq(tables.attempts.id, attemptId), eq(tables.attempts.eventId, eventId)))
      .for('update')
    const { finding } = await currentFinding(eventId, attemptId, input)
    const [proposed] = await tx.select({ id: tables.setAsides.id }).from(tables.setAsides).where(and(
      eq(tables.setAsides.attemptId, attemptId), eq(tables.setAsides.code, finding.code),
      input.runId === null ? isNull(tables.setAsides.runId) : eq(tables.setAsides.runId, input.runId)))
    if (proposed) {
      throw conflict(`The stewards' decision #${proposed.id} on this finding is awaiting signatures: sign that one`,
        { setAsideId: proposed.id })
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
    return { ...signed!, signers: 1, quorum: await quorumOf(tx, attemptId, finding.code) }
  })
}

/**
 * Another appointed steward signs a proposed set-aside, the same words: refused from one who already signed it, from
 * a steward of the attempt's team, and once the quorum is reached (the decision is made).
 */
export async function cosignSetAside(setAsideId: number, input: SignSheetInput, user: { id: number, name: string }) {
  const [found] = await useDb().select().from(tables.setAsides).where(eq(tables.setAsides.id, setAsideId))
  if (!found) throw notFound('No such set-aside')
  await refuseUnlessEntitled(found.eventId, user.id, found.attemptId, found.code)
  const proof = await signerProof(user.id, input)
  return useDb().transaction(async (tx) => {
    await tx.select({ id: tables.attempts.id }).from(tables.attempts).where(eq(tables.attempts.id, found.attemptId))
      .for('update')
    const signers = await signersOf(tx, setAsideId)
    const quorum = await quorumOf(tx, found.attemptId, found.code)
    if (signers.some(s => s.signerId === user.id)) throw conflict('You have already signed this decision')
    if (signers.length >= quorum) throw conflict('This decision already has the signatures it needs')
    const [proposer] = await tx.select({ name: tables.users.name }).from(tables.users)
      .where(eq(tables.users.id, found.officialId))
    const signature = await insertSignature(tx, {
      proof,
      kind: 'set-aside',
      subjectId: found.id,
      eventId: found.eventId,
      signerId: user.id,
      typedName: input.typedName,
      nameNote: input.nameNote,
      content: setAsideContent(found, proposer!.name),
    })
    return { ...found, signatureId: signature.id, signers: signers.length + 1, quorum }
  })
}
