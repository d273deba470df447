import { and, asc, eq, inArray } from 'drizzle-orm'
import type { NoticeInput } from '#shared/schemas/notices'

/**
 * Publishes an official notice: written, signed by its issuer (the one signing mechanism), and mailed to every
 * team member of the event through the outbox.
 */
export async function publishNotice(eventId: number, input: NoticeInput, user: { id: number, name: string }) {
  const proof = await signerProof(user.id, input)
  const notice = await useDb().transaction(async (tx) => {
    if (input.attemptId !== undefined) {
      const [a] = await tx.select({ id: tables.attempts.id }).from(tables.attempts)
        .where(and(eq(tables.attempts.id, input.attemptId), eq(tables.attempts.eventId, eventId)))
      if (!a) throw fieldInvalid('attemptId', 'is not an attempt of this event')
    }
    const [row] = await tx.insert(tables.notices).values({
      eventId, attemptId: input.attemptId ?? null, title: input.title, body: input.body, issuedBy: user.id,
    }).returning()
    const content = { eventId, notice: row!.id, attemptId: row!.attemptId, title: row!.title, body: row!.body }
    const signature = await insertSignature(tx, {
      proof, kind: 'notice', subjectId: row!.id, eventId, signerId: user.id, typedName: input.typedName,
      nameNote: input.nameNote, content,
    })
    const [signed] = await tx.update(tables.notices).set({ signatureId: signature.id })
      .where(eq(tables.notices.id, row!.id)).returning()
    return signed!
  })
  const teams = await useDb().selectDistinct({ email: tables.users.email, event: tables.events.name })
    .from(tables.memberships)
    .innerJoin(tables.users, eq(tables.users.id, tables.memberships.userId))
    .innerJoin(tables.events, eq(tables.events.id, tables.memberships.eventId))
    .where(and(eq(tables.memberships.eventId, eventId), eq(tables.memberships.role, 'team')))
  const site = useRuntimeConfig().siteUrl.replace(/\/$/, '')
  await queueMail(teams.map(t => ({
    to: t.email,
    subject: `Official notice: ${notice.title} (${t.event})`,
    text: `${notice.title}\n\n${notice.body}\n\nIssued by ${user.name}, signed, at ${notice.publishedAt.toISOString()}.`
      + `\nThe notice board: ${site}/events/${eventId}/notices\n`,
  })), { wait: false })
  return notice
}

/** The notice board: every notice, oldest first, with its issuer and signature; a team sees them all. */
export async function noticesAt(eventId: number, attemptIds?: number[]) {
  const rows = await useDb().select({
    n: tables.notices,
    issuer: tables.users.name,
    typedName: tables.signatures.typedName,
    signedAt: tables.signatures.signedAt,
    sha256: tables.signatures.contentSha256,
  }).from(tables.notices)
    .innerJoin(tables.users, eq(tables.users.id, tables.notices.issuedBy))
    .innerJoin(tables.signatures, eq(tables.signatures.id, tables.notices.signatureId))
    .where(attemptIds
      ? and(eq(tables.notices.eventId, eventId),
          inArray(tables.notices.attemptId, attemptIds.length ? attemptIds : [0]))
      : eq(tables.notices.eventId, eventId))
    .orderBy(asc(tables.notices.id))
  return rows.map(r => ({ ...r.n, issuer: r.issuer, typedName: r.typedName, signedAt: r.signedAt, sha256: r.sha256 }))
}
