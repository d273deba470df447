import { createHash } from 'node:crypto'
import { eq, or } from 'drizzle-orm'
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
  const fail = (message: string): Verification => ({ sealValid: false, keyFingerprint: null, items: [], message })
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
  const key = useSealKey()
  const items: { name: string, ok: boolean }[] = []
  const manifestText = new TextDecoder().decode(manifestFile.data)
  // The seal is checked first; only a sealed manifest is read and walked.
  const sealed = sealHolds(sha(manifestText), new TextDecoder().decode(sigFile.data.subarray(0, 1024)).trim())
  const manifest = sealed ? parseManifest(manifestText) : null
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
  const pdfSha = sha(bytes)
  const [issued] = await useDb()
    .select()
    .from(tables.dossiers)
    .where(or(eq(tables.dossiers.pdfSha256, pdfSha), eq(tables.dossiers.publicPdfSha256, pdfSha)))
  items.push({ name: 'PDF file as issued', ok: !!issued })
  const failing = items.filter(i => !i.ok).map(i => i.name)
  const sealValid = failing.length === 0
  return {
    sealValid,
    keyFingerprint: sealOk ? key.fingerprint : null,
    items,
    dossier: issued ? { id: issued.id, attemptId: issued.attemptId, version: issued.version } : null,
    message: sealValid
      ? `The seal is valid: signed by key ${key.fingerprint}, every attached file matches, and this is the file `
      + `issued as dossier version ${issued!.version} of attempt #${issued!.attemptId}.`
      : `Not intact: ${failing.join(', ')} ${failing.length === 1 ? 'does' : 'do'} not match what was sealed.`,
  }
}
