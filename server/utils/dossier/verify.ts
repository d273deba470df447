import { createHash, createPublicKey } from 'node:crypto'
import { and, desc, eq, gt, or } from 'drizzle-orm'
import { attachmentName } from './render'
import type { Verification } from '#shared/types/verification'
import { AttachmentTooLarge, readAttachments } from './pdf-attachments'

const sha = (b: Uint8Array | string) => createHash('sha256').update(b).digest('hex')

/** The largest manifest a dossier carries: far over any real one (a few hundred kB with every reading). */
const MANIFEST_LIMIT = 5 * 1024 * 1024

/** A sealed manifest, read only if it is the canonical form of itself (what was sealed). */
function parseManifest(text: string): { evidence?: { name: string, sha256: string }[] } | null {
  try {
    const m = JSON.parse(text)
    return canonicalJson(m) === text ? m : null
  }
  catch {
    return null
  }
}

/**
 * Checks a dossier PDF: the Ed25519 seal over its manifest, every attached file against the
 * manifest, and whether the whole file is byte for byte one this server issued.
 */
export async function verifyDossier(bytes: Uint8Array): Promise<Verification> {
  const fail = (message: string): Verification =>
    ({ sealValid: false, keyFingerprint: null, items: [], message, pdfSignature: null, standing: null })
  if (bytes.length < 8 || Buffer.from(bytes.subarray(0, 5)).toString('latin1') !== '%PDF-')
    return fail('This is not a PDF file.')
  let files: { name: string, data: Uint8Array }[]
  try {
    files = await readAttachments(bytes)
  }
  catch (e) {
    if (e instanceof AttachmentTooLarge) {
      return fail('An attached file unpacks to more than a dossier ever holds (64 MB each, 128 MB in all): '
        + 'this is not a Trapline dossier.')
    }
    return fail('This PDF cannot be read whole: it is truncated or damaged.')
  }
  const manifestFile = files.find(f => f.name === 'manifest.json')
  const sigFile = files.find(f => f.name === 'manifest.sig')
  if (!manifestFile || !sigFile)
    return fail('This PDF carries no Trapline seal (no manifest.json and manifest.sig attached).')
  if (manifestFile.data.length > MANIFEST_LIMIT) {
    return fail('The attached manifest is larger than any dossier\'s (5 MB): it is not a Trapline manifest.')
  }
  const keyring = await sealKeyring()
  const items: { name: string, ok: boolean }[] = []
  const manifestText = new TextDecoder().decode(manifestFile.data)
  // The seal is checked first, against every key that ever sealed here; only a sealed manifest is read.
  const sealText = new TextDecoder().decode(sigFile.data.subarray(0, 1024)).trim()
  const sealKey = keyring.find(k => sealHolds(sha(manifestText), sealText, createPublicKey(k.publicKeyPem)))
  const manifest = sealKey ? parseManifest(manifestText) : null
  const sealOk = manifest !== null
  items.push({ name: 'manifest.json', ok: sealOk })
  for (const e of manifest?.evidence ?? []) {
    const f = files.find(x => x.name === attachmentName(e.sha256, e.name))
    if (f) items.push({ name: e.name, ok: sha(f.data) === e.sha256 })
  }
  const known = new Set([
    'manifest.json',
    'manifest.sig',
    ...(manifest?.evidence ?? []).map(e => attachmentName(e.sha256, e.name)),
  ])
  for (const f of files.filter(x => !known.has(x.name))) items.push({ name: f.name, ok: false })
  // The standard PDF signature over the whole file, by a certificate of this installation.
  const pdfSig = checkPdfSignature(bytes)
  const signer = keyring.find(k => k.certificateSha256 && k.certificateSha256 === pdfSig.certificateSha256)
  items.push({ name: 'PDF signature', ok: pdfSig.valid && !!signer })
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
    keyFingerprint: sealOk ? sealKey!.keyId : null,
    items,
    pdfSignature: {
      valid: pdfSig.valid && !!signer,
      problem: pdfSig.problem ?? (signer ? null : 'signed by a certificate that is not one of this installation\'s'),
      subject: pdfSig.subject,
    },
    dossier: issued ? { id: issued.id, attemptId: issued.attemptId, version: issued.version } : null,
    standing,
    message: sealValid
      ? `The seal is valid: signed by key ${sealKey!.keyId}${sealKey!.retiredAt ? ' (retired since)' : ''}, the PDF `
      + `signature holds, every attached file matches, and this is the file issued as dossier version `
      + `${issued!.version} of attempt #${issued!.attemptId}. ${standing!.words}`
      : `Not intact: ${failing.join(', ')} ${failing.length === 1 ? 'does' : 'do'} not match what was sealed.`,
  }
}

/** What became of an issued dossier: the current version or superseded, and any decision on it. */
async function standingOf(d: typeof tables.dossiers.$inferSelect): Promise<NonNullable<Verification['standing']>> {
  const [newer] = await useDb().select({ version: tables.dossiers.version }).from(tables.dossiers)
    .where(and(eq(tables.dossiers.attemptId, d.attemptId), gt(tables.dossiers.version, d.version)))
    .orderBy(desc(tables.dossiers.version)).limit(1)
  const [decision] = await useDb().select().from(tables.decisions).where(eq(tables.decisions.dossierId, d.id))
  const state = decision
    ? (decision.decision === 'ratified' ? 'ratified' : 'refused')
    : newer ? 'superseded' : 'current'
  const words = {
    ratified: 'It was ratified.',
    refused: 'It was refused.',
    superseded: `It is superseded: version ${newer?.version} is the latest of this attempt.`,
    current: 'It is the latest version of this attempt, not yet decided.',
  }[state]
  return { state, latestVersion: newer?.version ?? d.version, words }
}
