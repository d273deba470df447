import { createHash } from 'node:crypto'
import { and, desc, eq, gt, or } from 'drizzle-orm'
import type { Verification } from '#shared/types/verification'
import { checkDossierFile } from './file-check'

const sha = (b: Uint8Array | string) => createHash('sha256').update(b).digest('hex')

/**
 * Checks a dossier PDF: what the file says about itself against every key that ever sealed here (the
 * PDF signature, the Ed25519 seal, the attached files; see `checkDossierFile`), whether the whole file
 * is byte for byte one this server issued, and what became of it.
 */
export async function verifyDossier(bytes: Uint8Array): Promise<Verification> {
  const check = await checkDossierFile(bytes, await sealKeyring())
  if (check.unreadable) {
    const message = check.unreadable
    return { sealValid: false, keyFingerprint: null, items: [], message, pdfSignature: null, standing: null }
  }
  const { items, sealKey, pdfSignature } = check
  const pdfSha = sha(bytes)
  const [issued] = await useDb()
    .select()
    .from(tables.dossiers)
    .where(or(eq(tables.dossiers.pdfSha256, pdfSha), eq(tables.dossiers.publicPdfSha256, pdfSha)))
  items.push({ name: 'PDF file as issued', ok: !!issued })
  const failing = items.filter(i => !i.ok).map(i => i.name)
  const sealValid = failing.length === 0
  const standing = issued ? await standingOf(issued) : null
  return {
    sealValid,
    keyFingerprint: sealKey?.keyId ?? null,
    items,
    pdfSignature: {
      valid: pdfSignature.valid && !pdfSignature.problem,
      problem: pdfSignature.problem,
      subject: pdfSignature.subject,
    },
    dossier: issued
      ? { id: issued.id, attemptId: issued.attemptId, version: issued.version, ...await namesOf(issued) }
      : null,
    standing,
    message: sealValid
      ? `The seal is valid: signed by key ${sealKey!.keyId}${sealKey!.retiredAt ? ' (retired since)' : ''}, the PDF `
      + `signature holds, every attached file matches, and this is the file issued as dossier version `
      + `${issued!.version} of attempt #${issued!.attemptId}. ${standing!.words}`
      : `Not intact: ${failing.join(', ')} ${failing.length === 1 ? 'does' : 'do'} not match what was sealed.`,
  }
}

/** The machine, team, distance and event a dossier is about, as the verification names them. */
async function namesOf(d: typeof tables.dossiers.$inferSelect) {
  const [row] = await useDb()
    .select({
      machineName: tables.machines.name,
      teamName: tables.teams.name,
      distanceLabel: tables.measuredDistances.label,
      eventName: tables.events.name,
    })
    .from(tables.attempts)
    .innerJoin(tables.entries, eq(tables.entries.id, tables.attempts.entryId))
    .innerJoin(tables.machines, eq(tables.machines.id, tables.entries.machineId))
    .innerJoin(tables.teams, eq(tables.teams.id, tables.entries.teamId))
    .innerJoin(tables.events, eq(tables.events.id, tables.attempts.eventId))
    .innerJoin(tables.measuredDistances, eq(tables.measuredDistances.id, d.distanceId))
    .where(eq(tables.attempts.id, d.attemptId))
  return row ?? { machineName: '', teamName: '', distanceLabel: '', eventName: '' }
}

/** What became of an issued dossier: the current version or superseded, and any decision on it. */
async function standingOf(d: typeof tables.dossiers.$inferSelect): Promise<NonNullable<Verification['standing']>> {
  const [newer] = await useDb().select({ version: tables.dossiers.version }).from(tables.dossiers)
    .where(and(
      eq(tables.dossiers.attemptId, d.attemptId),
      eq(tables.dossiers.distanceId, d.distanceId),
      gt(tables.dossiers.version, d.version),
    ))
    .orderBy(desc(tables.dossiers.version)).limit(1)
  const [decision] = await useDb().select().from(tables.decisions).where(eq(tables.decisions.dossierId, d.id))
  const [withdrawal] = await useDb().select().from(tables.withdrawals).where(eq(tables.withdrawals.dossierId, d.id))
  const [revoked] = await useDb().select().from(tables.claimRevocations)
    .where(eq(tables.claimRevocations.dossierId, d.id))
  const state = revoked
    ? 'revoked'
    : decision
      ? (decision.decision === 'ratified' ? 'ratified' : 'refused')
      : withdrawal ? 'withdrawn' : newer ? 'superseded' : 'current'
  const words = [
    decision ? `It was ${decision.decision}.` : '',
    revoked ? `The ratification was revoked: ${revoked.reason}` : '',
    withdrawal ? `The team withdrew its claim: ${withdrawal.reason}` : '',
    newer ? `It is superseded: version ${newer.version} is the latest of this attempt.` : '',
    !decision && !newer && !withdrawal ? 'It is the latest version of this attempt, not yet decided.' : '',
  ].filter(Boolean).join(' ')
  return { state, latestVersion: newer?.version ?? d.version, words }
}
