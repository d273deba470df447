import { and, asc, desc, eq } from 'drizzle-orm'
import { clockTime, confirmableAfter, confirmationWaits } from '#shared/rules/protests'
import { stewardsQuorum } from '#shared/rules/profile'
import type { SignSheetInput } from '#shared/schemas/event-day'

type Profile = (typeof tables.attempts.$inferSelect)['profile']

/** The signing of the timing sheet a confirmation rests on: the attempt's latest, while the sheet stays signed. */
export interface SheetInForce { id: number, at: Date, sha256: string }

/** The sheet in force from the live results' sheet state (`sheetState`): its latest signing, unless reopened since. */
export const sheetInForce = (sheet: { locked: boolean, latest: SheetInForce | null }) =>
  (sheet.locked ? sheet.latest : null)

/** What a steward signs in confirming a result: the signed timing sheet, the counted runs, the protests decided. */
export const confirmationContent = (attemptId: number, sheet: SheetInForce, runIds: number[],
  protests: { id: number, appealOf: number | null, outcome: string | null, voids: string | null }[]) => ({
  attempt: attemptId,
  timingSheet: { signature: sheet.id, sha256: sheet.sha256 },
  runs: runIds,
  protests: protests.map(p => ({ id: p.id, appealOf: p.appealOf, outcome: p.outcome, voids: p.voids })),
})

/** The attempt whose result is confirmed, with what its confirmation is judged on. */
interface ConfirmationSubject {
  eventId: number
  attemptId: number
  entryId: number
  profile: Profile
  timeZone: string
  sheet: SheetInForce | null
}

/** When the entry's latest inspection was signed: what a protest against an inspection decision counts from. */
async function inspectionPublishedAt(entryId: number) {
  const [s] = await useDb().select({ at: tables.signatures.signedAt }).from(tables.inspections)
    .innerJoin(tables.signatures, eq(tables.signatures.id, tables.inspections.signatureId))
    .where(eq(tables.inspections.entryId, entryId)).orderBy(desc(tables.signatures.signedAt)).limit(1)
  return s?.at ?? null
}

/**
 * The stewards' confirmation of an attempt's result as it stands at `now`: who confirmed the timing sheet in force
 * (a confirmation of an earlier signing, since reopened, or given before a decision on a protest, no longer
 * counts), how many must, and what it still waits for. Required where the attempt's frozen profile names its
 * stewards (copies frozen before it asked nothing).
 */
export async function confirmationOf(a: ConfirmationSubject, now: Date) {
  const quorum = stewardsQuorum(a.profile)
  const rows = await useDb().select({ id: tables.signatures.signerId, name: tables.users.name,
    at: tables.signatures.signedAt, content: tables.signatures.content, sha256: tables.signatures.contentSha256 })
    .from(tables.signatures).innerJoin(tables.users, eq(tables.users.id, tables.signatures.signerId))
    .where(and(eq(tables.signatures.kind, 'confirmation'), eq(tables.signatures.subjectId, a.attemptId)))
    .orderBy(asc(tables.signatures.id))
  const protests = await useDb().select().from(tables.protests)
    .where(eq(tables.protests.attemptId, a.attemptId)).orderBy(asc(tables.protests.id))
  // A confirmation counts for the timing sheet it names, and only if given after every decision on the attempt.
  const onSheet = (c: unknown) => (c as { timingSheet?: { signature?: number } }).timingSheet?.signature
  const lastDecision = Math.max(0, ...protests.map(p => (p.decidedAt ? +p.decidedAt : 0)))
  const signers = a.sheet ? rows.filter(r => onSheet(r.content) === a.sheet!.id && +r.at > lastDecision) : []
  const inspected = a.sheet ? await inspectionPublishedAt(a.entryId) : null
  const facts = {
    attemptId: a.attemptId,
    published: [a.sheet?.at, inspected].filter((d): d is Date => !!d).map(d => +d),
    rule: a.profile.protests?.value ?? null,
    timeZone: a.timeZone,
    protests,
  }
  const after = confirmableAfter(facts)
  return {
    required: !!a.profile.stewards,
    quorum,
    signers,
    confirmed: signers.length >= quorum,
    /** From when it may be confirmed (after this instant), as the event's clock shows it. */
    after: after === null ? null : new Date(after).toISOString(),
    afterClock: after === null ? null : clockTime(after, a.timeZone),
    waits: confirmationWaits(facts, +now),
    protests,
  }
}
export type Confirmation = Awaited<ReturnType<typeof confirmationOf>>

const CONFIRM_ACT = { signs: 'the confirmation of a result', conflicted: 'confirm this team\'s result' }

/** Why this steward may not confirm the attempt's result now, thrown; nothing when they may. */
function refuseUnconfirmable(r: Readiness, userId: number) {
  const item = (key: string) => r.items.find(i => i.key === key)
  const voided = r.live.findings.find(f => f.code === 'protest.result-void')
  if (voided) throw conflict(`Nothing to confirm: ${voided.message}`)
  if (!item('pair')?.met) throw conflict('There is no complete pair to confirm')
  const sheet = item('timing-sheet')!
  if (!sheet.met) throw conflict(`The stewards confirm a signed result, and the timing sheet is not: ${sheet.detail}`)
  const c = r.confirmation
  if (c.waits.length) throw conflict(`Not yet: ${c.waits.join('; ')}`, { after: c.after })
  if (c.signers.some(s => s.id === userId)) throw conflict('You have already confirmed this result')
  if (c.confirmed) {
    throw conflict(`This result is already confirmed by ${c.signers.map(s => s.name).join(' and ')}`)
  }
}

/**
 * An appointed steward of no team of the attempt confirms its result, signed: only after the protest period of the
 * signed timing sheet (and of the inspection) has ended, every protest and appeal on it is decided, the appeal
 * period of each decision has run out, and no upheld protest made the result void. The result is confirmed once the
 * profile's quorum of stewards has signed the same timing sheet; reopening the sheet asks for a new confirmation.
 * `clock.now` judges the periods (a test server's clock may differ); `clock.signedAt` only for the demo's calendar.
 */
export async function confirmResult(attemptId: number, input: SignSheetInput, user: { id: number },
  clock: { now: Date, signedAt?: Date }) {
  const [attempt] = await useDb().select({ eventId: tables.attempts.eventId }).from(tables.attempts)
    .where(eq(tables.attempts.id, attemptId))
  if (!attempt) throw notFound('No such attempt')
  await refuseUnlessIndependentSteward(attempt.eventId, user.id, attemptId, CONFIRM_ACT)
  refuseUnconfirmable(await readinessOf(attempt.eventId, attemptId, undefined, clock.now), user.id)
  const proof = await signerProof(user.id, input)
  return useDb().transaction(async (tx) => {
    // One confirmation at a time per attempt: the quorum is counted under the lock.
    await tx.select({ id: tables.attempts.id }).from(tables.attempts).where(eq(tables.attempts.id, attemptId))
      .for('update')
    const r = await readinessOf(attempt.eventId, attemptId, undefined, clock.now)
    refuseUnconfirmable(r, user.id)
    const c = r.confirmation
    const sheet = sheetInForce(r.live.sheet)!
    const signature = await insertSignature(tx, {
      proof,
      kind: 'confirmation',
      subjectId: attemptId,
      eventId: attempt.eventId,
      signerId: user.id,
      typedName: input.typedName,
      nameNote: input.nameNote,
      content: confirmationContent(attemptId, sheet, r.live.runs.filter(x => x.counted).map(x => x.id), c.protests),
      signedAt: clock.signedAt,
    })
    const signers = c.signers.length + 1
    return { attemptId, signatureId: signature.id, signers, quorum: c.quorum, confirmed: signers >= c.quorum }
  })
}

/** What a confirmation of the attempt would say now: for the signature report's "still matches". */
export async function confirmationContentNow(eventId: number, attemptId: number) {
  const r = await readinessOf(eventId, attemptId)
  const sheet = sheetInForce(r.live.sheet)
  if (!sheet) return null
  return confirmationContent(attemptId, sheet, r.live.runs.filter(x => x.counted).map(x => x.id),
    r.confirmation.protests)
}
