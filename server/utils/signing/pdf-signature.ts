// A standard PDF signature (ISO 32000 signature dictionary, SubFilter ETSI.CAdES.detached: the PAdES
// baseline form) over the whole file's byte range, and its check. @signpdf places the byte range and the
// signature; the CMS SignedData is built here with node-forge's ASN.1 (so that it carries the ESS
// signing-certificate-v2 attribute that PAdES asks for) and signed with Node's crypto. Plain imports
// only: the offline checker uses this file too.
import { createHash, sign as cryptoSign, verify as cryptoVerify, X509Certificate, type KeyObject } from 'node:crypto'
import forge from 'node-forge'
import { SignPdf } from '@signpdf/signpdf'
import { pdflibAddPlaceholder } from '@signpdf/placeholder-pdf-lib'
import { Signer, SUBFILTER_ETSI_CADES_DETACHED } from '@signpdf/utils'
import type { PDFDocument } from 'pdf-lib'

const { asn1 } = forge
const OID = {
  data: '1.2.840.113549.1.7.1',
  signedData: '1.2.840.113549.1.7.2',
  contentType: '1.2.840.113549.1.9.3',
  messageDigest: '1.2.840.113549.1.9.4',
  signingCertificateV2: '1.2.840.113549.1.9.16.2.47',
  sha256: '2.16.840.1.101.3.4.2.1',
  sha256WithRsa: '1.2.840.113549.1.1.11',
}
/** Room for the CMS in the file: a 3072-bit signature and a chain of two certificates fit in well under 8 kB. */
const SIGNATURE_ROOM = 12_000

const u = asn1.Class.UNIVERSAL
const T = asn1.Type
const seq = (v: forge.asn1.Asn1[]) => asn1.create(u, T.SEQUENCE, true, v)
const set = (v: forge.asn1.Asn1[]) => asn1.create(u, T.SET, true, v)
const oid = (o: string) => asn1.create(u, T.OID, false, asn1.oidToDer(o).getBytes())
const octets = (b: Buffer) => asn1.create(u, T.OCTETSTRING, false, b.toString('binary'))
const int = (n: number) => asn1.create(u, T.INTEGER, false, asn1.integerToDer(n).getBytes())
const nul = () => asn1.create(u, T.NULL, false, '')
const der = (a: forge.asn1.Asn1) => Buffer.from(asn1.toDer(a).getBytes(), 'binary')
const fromDer = (b: Buffer) => asn1.fromDer(forge.util.createBuffer(b.toString('binary')))
const sha256 = (b: Uint8Array) => createHash('sha256').update(b).digest()
const attribute = (type: string, value: forge.asn1.Asn1) => seq([oid(type), set([value])])

/** DER orders the members of a SET OF by their encodings. */
const sortedSet = (members: forge.asn1.Asn1[]) =>
  members.map(m => ({ m, d: der(m) })).sort((a, b) => Buffer.compare(a.d, b.d)).map(x => x.m)

/** The CMS signer: detached SignedData over the byte range, with the PAdES baseline attributes. */
class SealSigner extends Signer {
  constructor(private certificatesDer: Buffer[], private key: KeyObject) {
    super()
  }

  override async sign(content: Buffer): Promise<Buffer> {
    const [leaf] = this.certificatesDer
    const tbs = fromDer(leaf!).value[0] as forge.asn1.Asn1
    const fields = tbs.value as forge.asn1.Asn1[]
    const at = fields[0]!.tagClass === asn1.Class.CONTEXT_SPECIFIC ? 1 : 0 // [0] version present
    const serial = fields[at]!
    const issuer = fields[at + 2]!
    const attrs = sortedSet([
      attribute(OID.contentType, oid(OID.data)),
      attribute(OID.messageDigest, octets(sha256(content))),
      // SigningCertificateV2 { certs SEQUENCE OF ESSCertIDv2 { certHash } } (RFC 5035; SHA-256 by default).
      attribute(OID.signingCertificateV2, seq([seq([seq([octets(sha256(leaf!))])])])),
    ])
    const signature = cryptoSign('sha256', der(set(attrs)), this.key)
    const signerInfo = seq([
      int(1),
      seq([issuer, serial]),
      seq([oid(OID.sha256), nul()]),
      asn1.create(asn1.Class.CONTEXT_SPECIFIC, 0, true, attrs),
      seq([oid(OID.sha256WithRsa), nul()]),
      octets(signature),
    ])
    const signedData = seq([
      int(1),
      set([seq([oid(OID.sha256), nul()])]),
      seq([oid(OID.data)]),
      asn1.create(asn1.Class.CONTEXT_SPECIFIC, 0, true, this.certificatesDer.map(fromDer)),
      set([signerInfo]),
    ])
    return der(seq([oid(OID.signedData), asn1.create(asn1.Class.CONTEXT_SPECIFIC, 0, true, [signedData])]))
  }
}

/** The octets of a signed attribute's first value, by its OID. */
function attributeValue(attrs: forge.asn1.Asn1[], type: string) {
  const parts = (a: forge.asn1.Asn1) => a.value as forge.asn1.Asn1[]
  const found = attrs.find(a => asn1.derToOid(forge.util.createBuffer(parts(a)[0]!.value as string)) === type)
  return found ? Buffer.from(parts(parts(found)[1]!)[0]!.value as string, 'binary') : null
}

/**
 * The DER element at the start of a zero-padded placeholder: its own length says where it ends. (A
 * signature may itself end in a zero byte, so the padding is never stripped by its value.)
 */
function derPrefix(padded: Buffer): Buffer {
  const first = padded[1] ?? 0
  if (first < 0x80) return padded.subarray(0, 2 + first)
  const octets = first & 0x7f
  if (octets < 1 || octets > 4) throw new Error('not a DER length')
  return padded.subarray(0, 2 + octets + padded.readUIntBE(2, octets))
}

const pemToDer = (pem: string) => Buffer.from(pem.replace(/-----[^-]+-----|\s/g, ''), 'base64')

/** Adds the signature dictionary's placeholder to a document before it is saved (no visible widget). */
export function addSignaturePlaceholder(doc: PDFDocument, facts: { reason: string, name: string, location: string }) {
  pdflibAddPlaceholder({
    pdfDoc: doc,
    reason: facts.reason,
    contactInfo: '',
    name: facts.name,
    location: facts.location,
    signatureLength: SIGNATURE_ROOM,
    subFilter: SUBFILTER_ETSI_CADES_DETACHED,
  })
}

/** Signs a saved PDF that carries the placeholder: the byte range and the CMS are filled in place. */
export async function signPdf(pdf: Uint8Array, certificatesPem: string[], key: KeyObject): Promise<Uint8Array> {
  const signer = new SealSigner(certificatesPem.map(pemToDer), key)
  return new SignPdf().sign(Buffer.from(pdf), signer)
}

export interface PdfSignatureCheck {
  /** Whether the last signature covers the whole file, its digest matches and its CMS signature holds. */
  valid: boolean
  /** Why not, in words; null when valid. */
  problem: string | null
  /** The signing certificate's SHA-256 fingerprint (hex, colon-free) and subject, when one was found. */
  certificateSha256: string | null
  subject: string | null
}

/**
 * Checks the PDF's last signature: its byte range covers the whole file but the signature's own
 * contents, the SHA-256 of those bytes is the signed message digest, and the CMS signature over the
 * signed attributes holds with the embedded signing certificate's key. Which certificates to trust is
 * the caller's question (`certificateSha256`).
 */
export function checkPdfSignature(pdf: Uint8Array): PdfSignatureCheck {
  const bad = (problem: string, cert: X509Certificate | null = null): PdfSignatureCheck => ({
    valid: false,
    problem,
    certificateSha256: cert ? cert.fingerprint256.replaceAll(':', '').toLowerCase() : null,
    subject: cert?.subject ?? null,
  })
  const bytes = Buffer.from(pdf)
  const text = bytes.toString('latin1')
  const ranges = [...text.matchAll(/\/ByteRange\s*\[\s*(\d+)\s+(\d+)\s+(\d+)\s+(\d+)\s*\]/g)]
  const last = ranges.at(-1)
  if (!last) return bad('the file carries no PDF signature')
  const [a, b, c, d] = last.slice(1, 5).map(Number) as [number, number, number, number]
  if (a !== 0 || c + d !== bytes.length || b >= c)
    return bad('the signature does not cover the whole file (bytes were added or removed after signing)')
  const hex = text.slice(b, c)
  if (!/^<[0-9a-fA-F]+>$/.test(hex)) return bad('the signature\'s contents are not where its byte range says')
  const signed = Buffer.concat([bytes.subarray(a, a + b), bytes.subarray(c, c + d)])
  let cert: X509Certificate | null = null
  try {
    const cms = fromDer(derPrefix(Buffer.from(hex.slice(1, -1), 'hex')))
    const signedData = ((cms.value as forge.asn1.Asn1[])[1]!.value as forge.asn1.Asn1[])[0]!
    const parts = signedData.value as forge.asn1.Asn1[]
    const tagged = (list: forge.asn1.Asn1[]) =>
      list.find(p => p.tagClass === asn1.Class.CONTEXT_SPECIFIC && p.type === 0)
    const certs = (tagged(parts)?.value ?? []) as forge.asn1.Asn1[]
    const signerInfo = (parts.at(-1)!.value as forge.asn1.Asn1[])[0]!
    const info = signerInfo.value as forge.asn1.Asn1[]
    const attrs = tagged(info)
    const signature = Buffer.from(info.at(-1)!.value as string, 'binary')
    if (!attrs || !certs.length) return bad('the signature has no signed attributes or no certificate')
    cert = new X509Certificate(der(certs[0]!))
    const digest = attributeValue(attrs.value as forge.asn1.Asn1[], OID.messageDigest)
    if (!digest || !digest.equals(sha256(signed))) return bad('the file was changed after it was signed', cert)
    const asSet = set(attrs.value as forge.asn1.Asn1[])
    if (!cryptoVerify('sha256', der(asSet), cert.publicKey, signature))
      return bad('the signature does not hold with its certificate\'s key', cert)
  }
  catch {
    return bad('the signature cannot be read', cert)
  }
  return {
    valid: true,
    problem: null,
    certificateSha256: cert.fingerprint256.replaceAll(':', '').toLowerCase(),
    subject: cert.subject,
  }
}
