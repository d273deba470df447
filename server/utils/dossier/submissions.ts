import { and, desc, eq, gt, inArray } from 'drizzle-orm'
import { cmp, fromDecimal } from '#shared/rules/exact'
import { convertSpeed, publishedInMs } from '#shared/rules/units'
import { localDate } from '#shared/rules/zoned'
import type { EventAccess } from '../auth/auth'
import type { DecisionInput, HomologationInput, RevocationInput } from '#shared/schemas/inspection'
import { revokedByOf } from '#shared/rules/profile'
import { OFFICIAL_FUNCTION_LABELS } from '#shared/constants'

/** The team an attempt belongs to; a team may act only on its own attempts (else 404). */
export async function assertOwnAttempt(access: EventAccess, attemptId: number) {
  const [row] = await useDb()
    .select({ teamId: tables.entries.teamId })
    .from(tables.attempts)
    .innerJoin(tables.entries, eq(tables.entries.id, tables.attempts.entryId))
    .where(and(eq(tables.attempts.id, attemptId), eq(tables.attempts.eventId, access.eventId)))
  if (!row) throw notFound('No such attempt')
  if (actsAsTeamOnly(access) && !access.teamIds.includes(row.teamId))
    throw notFound('No such attempt')
  return row.teamId
}

export async function dossiersOf(attemptId: number) {
  const rows = await useDb()
    .select({
      d: tables.dossiers,
      submittedAt: tables.submissions.submittedAt,
      decision: tables.decisions.decision,
      reasons: tables.decisions.reasons,
      decidedAt: tables.decisions.decidedAt,
      signatureId: tables.decisions.signatureId,
      withdrawal: tables.withdrawals,
      homologation: tables.homologations,
      revocation: tables.claimRevocations,
    })
    .from(tables.dossiers)
    .leftJoin(tables.submissions, eq(tables.submissions.dossierId, tables.dossiers.id))
    .leftJoin(tables.decisions, eq(tables.decisions.dossierId, tables.dossiers.id))
    .leftJoin(tables.withdrawals, eq(tables.withdrawals.dossierId, tables.dossiers.id))
    .leftJoin(tables.homologations, eq(tables.homologations.dossierId, tables.dossiers.id))
    .leftJoin(tables.claimRevocations, eq(tables.claimRevocations.dossierId, tables.dossiers.id))
    .where(eq(tables.dossiers.attemptId, attemptId))
    .orderBy(desc(tables.dossiers.version))
  return rows.map(r => ({
    id: r.d.id,
    version: r.d.version,
    distanceId: r.d.distanceId,
    distanceLabel: (r.d.manifest as { entry: { distanceLabel: string } }).entry.distanceLabel,
    manifestSha256: r.d.manifestSha256,
    pdfSha256: r.d.pdfSha256,
    pdfSize: r.d.pdfSize,
    keyFingerprint: r.d.keyFingerprint,
    createdAt: r.d.createdAt,
    supersedesId: r.d.supersedesId,
    submittedAt: r.submittedAt,
    decision: r.decision
      ? { decision: r.decision, reasons: r.reasons, at: r.decidedAt, signatureId: r.signatureId }
      : null,
    withdrawal: r.withdrawal ? { reason: r.withdrawal.reason, at: r.withdrawal.withdrawnAt } : null,
    homologation: r.homologation?.signatureId
      ? { reference: r.homologation.reference, on: r.homologation.homologatedOn }
      : null,
    revocation: r.revocation?.signatureId ? { reason: r.revocation.reason, at: r.revocation.createdAt } : null,
  }))
}

/** What the revoking official signs: the ratified file by its hashes, the decision revoked, and why. */
export const revocationContent = (d: typeof tables.dossiers.$inferSelect, decisionId: number, reason: string) => ({
  dossier: d.id,
  attempt: d.attemptId,
  version: d.version,
  pdfSha256: d.pdfSha256,
  decision: decisionId,
  reason,
})

/**
 * The holder of the function the attempt's profile names (the sanctioning body's observer internationally, a
 * steward at a club meet) revokes a ratification, with reasons, signed: the claim is open again, the record it set
 * no longer stands, and the decision and its revocation both stay in the history. Never by a member of the team.
 */
export async function revokeRatification(dossierId: number, input: RevocationInput,
  user: { id: number, name: string }) {
  const d = await dossierRow(dossierId)
  const [attempt] = await useDb().select({ profile: tables.attempts.profile }).from(tables.attempts)
    .where(eq(tables.attempts.id, d.attemptId))
  const fn = revokedByOf(attempt!.profile)
  if (!(await holdsAppointment(d.eventId, user.id, fn))) {
    throw forbidden(`Only the appointed ${OFFICIAL_FUNCTION_LABELS[fn].toLowerCase()} revokes a ratification under `
      + 'this profile')
  }
  await refuseConflicted(useDb(), { eventId: d.eventId, userId: user.id },
    [await teamOfAttemptIn(useDb(), d.attemptId)], 'revoke this team\'s ratification')
  const proof = await signerProof(user.id, input)
  return useDb().transaction(async (tx) => {
    await lockClaim(tx, d.attemptId, d.distanceId)
    const [decision] = await tx.select().from(tables.decisions).where(eq(tables.decisions.dossierId, dossierId))
    if (decision?.decision !== 'ratified') throw conflict('Only a ratified claim is revoked')
    const [row] = await tx.insert(tables.claimRevocations)
      .values({ dossierId, reason: input.reason, revokedBy: user.id }).onConflictDoNothing().returning()
    if (!row) throw conflict('This ratification is already revoked')
    const sig = await insertSignature(tx, {
      proof, kind: 'revocation', subjectId: row.id, eventId: d.eventId, signerId: user.id,
      typedName: input.typedName, nameNote: input.nameNote, content: revocationContent(d, decision.id, input.reason),
    })
    const [signed] = await tx.update(tables.claimRevocations).set({ signatureId: sig.id })
      .where(eq(tables.claimRevocations.id, row.id)).returning()
    return signed!
  })
}

/**
 * A claim is not ratified while a protest or appeal on its attempt is open, nor from a dossier sealed before a
 * decision on one: the decision belongs in the file, so a new version is issued first.
 */
async function refuseUnderProtest(tx: Tx, d: { attemptId: number, createdAt: Date }) {
  const open = await openProtestsOn([d.attemptId], tx)
  if (open.length) {
    throw conflict(`This claim is under protest (${open.map(p => `${p.appealOf ? 'appeal' : 'protest'} #${p.id}`)
      .join(', ')}): it is ratified only once each is decided`)
  }
  const [later] = await tx.select({ id: tables.protests.id }).from(tables.protests)
    .where(and(eq(tables.protests.attemptId, d.attemptId), gt(tables.protests.decidedAt, d.createdAt))).limit(1)
  if (later) {
    throw conflict(`Protest #${later.id} was decided after this dossier was sealed: issue a new version with the `
      + 'decision in it, then submit that')
  }
}

/** Only the latest version of a claim is submitted or decided: an older one was replaced by the team. */
async function refuseIfSuperseded(d: { attemptId: number, distanceId: number, version: number }) {
  const latest = await latestDossier(d.attemptId, d.distanceId)
  if (latest && latest.version !== d.version) {
    throw conflict(`Version ${d.version} is superseded by version ${latest.version}: only the latest version of a `
      + 'claim is submitted or decided')
  }
}

async function dossierRow(id: number) {
  const [d] = await useDb().select().from(tables.dossiers).where(eq(tables.dossiers.id, id))
  if (!d) throw notFound('No such dossier')
  return d
}

const emailsOf = async (eventId: number, role: 'official' | 'team', teamId?: number) =>
  (
    await useDb()
      .select({ email: tables.users.email })
      .from(tables.memberships)
      .innerJoin(tables.users, eq(tables.users.id, tables.memberships.userId))
      .where(
        and(
          eq(tables.memberships.eventId, eventId),
          eq(tables.memberships.role, role),
          ...(teamId ? [eq(tables.memberships.teamId, teamId)] : []),
        ),
      )
  ).map(r => r.email)

/** The team submits a sealed dossier: recorded first, then the officials are e-mailed the PDF. */
export async function submitDossier(dossierId: number, userId: number) {
  const d = await dossierRow(dossierId)
  const row = await useDb().transaction(async (tx) => {
    await lockClaim(tx, d.attemptId, d.distanceId)
    await refuseIfSuperseded(d)
    await refuseIfDecided(d.attemptId, d.distanceId, tx)
    const [inserted] = await tx
      .insert(tables.submissions)
      .values({ dossierId, submittedBy: userId })
      .onConflictDoNothing()
      .returning()
    if (!inserted) throw conflict('This dossier has already been submitted')
    return inserted
  })
  const m = d.manifest as {
    entry: { machineName: string, teamName: string, className: string, distanceLabel: string }
    result: { kmh: string, mph: string }
  }
  const site = useRuntimeConfig().siteUrl.replace(/\/$/, '')
  const name = `trapline-dossier-attempt-${d.attemptId}-v${d.version}.pdf`
  const mail = await queueMail(
    (await emailsOf(d.eventId, 'official')).map(to => ({
      to,
      subject: `Trapline: dossier submitted for ratification — ${m.entry.machineName}, ${m.result.kmh} km/h`,
      text:
        `A sealed dossier has been submitted for ratification.\n\n${m.entry.machineName} (${m.entry.teamName}), `
        + `${m.entry.className}, ${m.entry.distanceLabel}: ${m.result.kmh} km/h, ${m.result.mph} mph.\n\n`
        + `PDF: ${name}, attached.\nSHA-256 of the PDF: ${d.pdfSha256}\nManifest SHA-256: ${d.manifestSha256}\nSeal `
        + `key: ${d.keyFingerprint}\n\nVerify it at ${site}/verify and decide at `
        + `${site}/attempts/${d.attemptId}/dossier\n`,
      attachmentSha256: d.pdfSha256,
      attachmentName: name,
    })),
  )
  return {
    submission: row,
    mail,
    message:
      mail.sent === mail.queued
        ? `E-mailed to ${mail.sent} official(s).`
        : `Submitted. ${mail.queued - mail.sent} e-mail(s) could not be sent yet and will be retried; nothing is lost.`,
  }
}

/** What an official signs in deciding on a dossier: the sealed file by its hashes, and the decision. */
export const decisionContent = (
  d: typeof tables.dossiers.$inferSelect,
  x: { decision: string, reasons: string },
) => ({
  dossier: d.id,
  attempt: d.attemptId,
  version: d.version,
  pdfSha256: d.pdfSha256,
  manifestSha256: d.manifestSha256,
  decision: x.decision,
  reasons: x.reasons,
})

/** An official ratifies or refuses a submitted dossier, with reasons, signed; the team is e-mailed. */
export async function decideDossier(
  dossierId: number,
  input: DecisionInput,
  user: { id: number, name: string },
) {
  const d = await dossierRow(dossierId)
  const [submitted] = await useDb()
    .select()
    .from(tables.submissions)
    .where(eq(tables.submissions.dossierId, dossierId))
  if (!submitted) throw conflict('This dossier has not been submitted')
  const act = `${input.decision === 'ratified' ? 'ratify' : 'refuse'} this team's claim`
  const teamId = await teamOfAttemptIn(useDb(), d.attemptId)
  await refuseConflicted(useDb(), { eventId: d.eventId, userId: user.id }, [teamId], act)
  const proof = await signerProof(user.id, input)
  const decision = await useDb().transaction(async (tx) => {
    await lockClaim(tx, d.attemptId, d.distanceId)
    await refuseIfWithdrawn(dossierId, tx)
    const [existing] = await tx.select().from(tables.decisions).where(eq(tables.decisions.dossierId, dossierId))
    if (existing)
      throw conflict(`This dossier was already ${existing.decision}`)
    await refuseIfSuperseded(d)
    await refuseIfDecided(d.attemptId, d.distanceId, tx)
    if (input.decision === 'ratified') await refuseUnderProtest(tx, d)
    const content = decisionContent(d, input)
    const sig = await insertSignature(tx, {
      proof,
      kind: 'ratification',
      subjectId: d.id,
      eventId: d.eventId,
      signerId: user.id,
      typedName: input.typedName,
      nameNote: input.nameNote,
      content,
    })
    const [row] = await tx
      .insert(tables.decisions)
      .values({
        dossierId,
        decision: input.decision,
        reasons: input.reasons,
        signatureId: sig.id,
        decidedBy: user.id,
      })
      .returning()
    if (input.decision === 'ratified') await standFromRatification(tx, d, row!.decidedAt)
    return row!
  })
  const m = d.manifest as { entry: { machineName: string }, result: { kmh: string } }
  await queueMail(
    (await emailsOf(d.eventId, 'team', teamId)).map(to => ({
      to,
      subject: `Trapline: dossier ${input.decision} — ${m.entry.machineName}, ${m.result.kmh} km/h`,
      text: `The officials have ${input.decision} dossier version ${d.version} of attempt `
        + `#${d.attemptId}.\n\nReasons: ${input.reasons}\nSigned by ${input.typedName}.\n`,
    })),
  )
  return decision
}

export async function isRatified(dossierId: number) {
  const rows = await useDb()
    .select({ id: tables.decisions.id })
    .from(tables.decisions)
    .where(and(eq(tables.decisions.dossierId, dossierId), inArray(tables.decisions.decision, ['ratified'])))
  return rows.length > 0
}

/**
 * A ratified result becomes the event's standing record for its class and distance from the moment
 * of ratification, when it is faster than the record standing then; a tie never displaces the holder.
 * It is kept in the unit the class's record was published in (km/h when the book had none), and
 * compared in that unit at the profile's published decimals.
 */
async function standFromRatification(tx: Tx, d: typeof tables.dossiers.$inferSelect, ratifiedAt: Date) {
  const m = d.manifest as {
    entry: { className: string, distanceLabel: string }
    result: { kmh: string, mph: string }
    event: { timeZone: string }
  }
  const { className, distanceLabel } = m.entry
  const records = tables.standingRecords
  const standing = await tx
    .select({ speed: records.speed, unit: records.unit })
    .from(records)
    .where(and(
      eq(records.eventId, d.eventId),
      eq(records.className, className),
      eq(records.distanceLabel, distanceLabel),
    ))
  const best = standing.reduce<typeof standing[number] | null>(
    (b, r) => (b === null || cmp(publishedInMs(r), publishedInMs(b)) > 0 ? r : b),
    null,
  )
  const unit = best?.unit ?? 'km/h'
  const speed = unit === 'mph' ? m.result.mph : m.result.kmh
  if (best !== null && cmp(fromDecimal(speed), convertSpeed(publishedInMs(best), 'm/s', unit)) <= 0) return
  await tx.insert(records).values({
    eventId: d.eventId,
    className,
    distanceLabel,
    speed,
    unit,
    setOn: localDate(ratifiedAt.getTime(), m.event.timeZone),
    setAt: ratifiedAt,
    dossierId: d.id,
    note: `ratified dossier #${d.id}, version ${d.version}`,
  })
}

/** What a decision on a dossier will sign, before it is written (for a passkey's challenge). */
export async function decisionDraftContent(dossierId: number, draft: { decision: string, reasons: string }) {
  const [d] = await useDb().select().from(tables.dossiers).where(eq(tables.dossiers.id, dossierId))
  if (!d) throw notFound('No such dossier')
  return decisionContent(d, draft)
}

type HomologationRow = typeof tables.homologations.$inferSelect

/** What an official signs in entering a homologation. */
export const homologationContent = (h: HomologationRow, officialName: string, pdfSha256: string) => ({
  homologation: h.id,
  dossier: h.dossierId,
  pdfSha256,
  reference: h.reference,
  homologatedOn: h.homologatedOn,
  official: officialName,
})

/**
 * Records the sanctioning body's homologation of a ratified dossier (its reference and date), entered
 * and signed by an official of the event; once per dossier (409 after), never on one not ratified.
 */
export async function homologate(
  dossierId: number,
  input: HomologationInput,
  user: { id: number, name: string },
) {
  const claim = await dossierRow(dossierId)
  await refuseConflicted(useDb(), { eventId: claim.eventId, userId: user.id },
    [await teamOfAttemptIn(useDb(), claim.attemptId)], 'enter the homologation of this team\'s record')
  const proof = await signerProof(user.id, input)
  return useDb().transaction(async (tx) => {
    const [d] = await tx.select().from(tables.dossiers).where(eq(tables.dossiers.id, dossierId)).for('update')
    if (!d) throw notFound('No such dossier')
    const [decision] = await tx.select().from(tables.decisions).where(eq(tables.decisions.dossierId, dossierId))
    if (decision?.decision !== 'ratified') throw conflict('Only a ratified record is homologated')
    const [row] = await tx.insert(tables.homologations)
      .values({ dossierId, reference: input.reference, homologatedOn: input.homologatedOn, officialId: user.id })
      .onConflictDoNothing().returning()
    if (!row) throw conflict('This record\'s homologation is already entered')
    const sig = await insertSignature(tx, {
      proof,
      kind: 'homologation',
      subjectId: row.id,
      eventId: d.eventId,
      signerId: user.id,
      typedName: input.typedName,
      nameNote: input.nameNote,
      content: homologationContent(row, user.name, d.pdfSha256),
    })
    const [signed] = await tx.update(tables.homologations).set({ signatureId: sig.id })
      .where(eq(tables.homologations.id, row.id)).returning()
    return signed!
  })
}
