// What a dossier file says about itself, checked against a list of public keys and nothing else: the
// standard PDF signature, the Ed25519 seal over the manifest, and every attached file against the
// manifest. No database and no Nitro auto-imports: the offline checker (scripts/verify.ts) runs it too.
import { createHash, createPublicKey, verify } from 'node:crypto'
import { canonicalJson } from '../../../shared/utils/canonical-json'
import { checkPdfSignature, type PdfSignatureCheck } from '../signing/pdf-signature'
import { AttachmentTooLarge, attachmentName, readAttachments } from './pdf-attachments'

/** A key as `GET /api/seal` publishes it. */
export interface PublishedKey {
  keyId: string
  publicKeyPem: string
  certificateSha256: string | null
  retiredAt: string | Date | null
}

export interface FileCheck {
  /** Why the file could not be checked at all (not a PDF, damaged, no seal); null when it was. */
  unreadable: string | null
  items: { name: string, ok: boolean }[]
  /** The published key whose Ed25519 seal holds over the manifest. */
  sealKey: PublishedKey | null
  pdfSignature: PdfSignatureCheck & { byPublishedKey: PublishedKey | null }
}

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

function sealHoldsWith(key: PublishedKey, sha256Hex: string, sealBase64: string) {
  try {
    const publicKey = createPublicKey(key.publicKeyPem)
    return verify(null, Buffer.from(sha256Hex, 'hex'), publicKey, Buffer.from(sealBase64, 'base64'))
  }
  catch {
    return false
  }
}

export async function checkDossierFile(bytes: Uint8Array, keys: PublishedKey[]): Promise<FileCheck> {
  const noPdfSig = { ...checkPdfSignature(new Uint8Array()), byPublishedKey: null }
  const unreadable = (why: string): FileCheck => ({ unreadable: why, items: [], sealKey: null, pdfSignature: noPdfSig })
  if (bytes.length < 8 || Buffer.from(bytes.subarray(0, 5)).toString('latin1') !== '%PDF-')
    return unreadable('This is not a PDF file.')
  let files: { name: string, data: Uint8Array }[]
  try {
    files = await readAttachments(bytes)
  }
  catch (e) {
    if (e instanceof AttachmentTooLarge) {
      return unreadable('An attached file unpacks to more than a dossier ever holds (64 MB each, 128 MB in all): '
        + 'this is not a Trapline dossier.')
    }
    return unreadable('This PDF cannot be read whole: it is truncated or damaged.')
  }
  const manifestFile = files.find(f => f.name === 'manifest.json')
  const sigFile = files.find(f => f.name === 'manifest.sig')
  if (!manifestFile || !sigFile)
    return unreadable('This PDF carries no Trapline seal (no manifest.json and manifest.sig attached).')
  if (manifestFile.data.length > MANIFEST_LIMIT)
    return unreadable('The attached manifest is larger than any dossier\'s (5 MB): it is not a Trapline manifest.')
  const items: { name: string, ok: boolean }[] = []
  const manifestText = new TextDecoder().decode(manifestFile.data)
  // The seal is checked first, against every published key; only a sealed manifest is read and walked.
  const sealText = new TextDecoder().decode(sigFile.data.subarray(0, 1024)).trim()
  const sealKey = keys.find(k => sealHoldsWith(k, sha(manifestText), sealText)) ?? null
  const manifest = sealKey ? parseManifest(manifestText) : null
  items.push({ name: 'manifest.json', ok: manifest !== null })
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
  // The standard PDF signature over the whole file, by the certificate of a published key.
  const pdfSig = checkPdfSignature(bytes)
  const byPublishedKey = keys.find(k => !!k.certificateSha256 && k.certificateSha256 === pdfSig.certificateSha256)
    ?? null
  items.push({ name: 'PDF signature', ok: pdfSig.valid && !!byPublishedKey })
  return {
    unreadable: null,
    items,
    sealKey: manifest ? sealKey : null,
    pdfSignature: {
      ...pdfSig,
      problem: pdfSig.problem
        ?? (byPublishedKey ? null : 'signed by a certificate that is not one of the published keys'),
      byPublishedKey,
    },
  }
}
