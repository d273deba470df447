// The seal's key material: an Ed25519 key for the manifest, and an X.509 certificate with its RSA key for
// the PDF signature, issued by the operator's certificate authority or, where none is given, by a small
// self-made one. Plain Node and node-forge only (no Nitro auto-imports): the rotation script uses it too.
import {
  createHash,
  createPrivateKey,
  createPublicKey,
  generateKeyPairSync,
  randomBytes,
  X509Certificate,
  type KeyObject,
} from 'node:crypto'
import { existsSync, mkdirSync, readFileSync, renameSync, writeFileSync } from 'node:fs'
import { join } from 'node:path'
import forge from 'node-forge'

/** The files of a key set, in one folder (a mounted secret works the same). */
export const KEY_FILES = {
  ed25519: 'seal-ed25519.pem',
  certificate: 'seal-certificate.pem',
  certificateKey: 'seal-certificate-key.pem',
} as const
const CA_FILES = { certificate: 'ca-certificate.pem', key: 'ca-key.pem' } as const

export interface SealKeys {
  /** The key id: SHA-256 of the Ed25519 public key (DER), in groups of four hex digits. */
  keyId: string
  privateKey: KeyObject
  publicKey: KeyObject
  publicPem: string
  /** The signing certificate then its issuers, PEM, and the certificate's private key. */
  certificatePem: string
  chainPem: string[]
  certificateKey: KeyObject
}

/** SHA-256 of a public key's DER form, in groups of four hex digits. */
export function fingerprintOf(publicKey: KeyObject) {
  const der = publicKey.export({ type: 'spki', format: 'der' })
  return createHash('sha256').update(der).digest('hex').match(/.{4}/g)!.join(':')
}

/** PEM blocks of certificates, in order. */
export const pemBlocks = (text: string) =>
  text.match(/-----BEGIN CERTIFICATE-----[^-]+-----END CERTIFICATE-----/g) ?? []

/** A key set from PEM texts (files, environment variables or a mounted secret). */
export function keysFromPem(pem: { ed25519: string, certificate: string, certificateKey: string }): SealKeys {
  const privateKey = createPrivateKey(pem.ed25519)
  const publicKey = createPublicKey(privateKey)
  const [certificatePem, ...chainPem] = pemBlocks(pem.certificate)
  if (!certificatePem) throw new Error('the seal certificate file holds no certificate')
  const certificateKey = createPrivateKey(pem.certificateKey)
  if (!new X509Certificate(certificatePem).checkPrivateKey(certificateKey))
    throw new Error('the seal certificate does not match its private key')
  return {
    keyId: fingerprintOf(publicKey),
    privateKey,
    publicKey,
    publicPem: publicKey.export({ type: 'spki', format: 'pem' }).toString(),
    certificatePem,
    chainPem,
    certificateKey,
  }
}

export const hasKeySet = (dir: string) => Object.values(KEY_FILES).every(f => existsSync(join(dir, f)))

export function readKeySet(dir: string): SealKeys {
  const read = (f: string) => readFileSync(join(dir, f), 'utf8')
  return keysFromPem({
    ed25519: read(KEY_FILES.ed25519),
    certificate: read(KEY_FILES.certificate),
    certificateKey: read(KEY_FILES.certificateKey),
  })
}

const pemOfKey = (k: KeyObject) => k.export({ type: 'pkcs8', format: 'pem' }).toString()
const forgeKey = (k: KeyObject) => forge.pki.privateKeyFromPem(pemOfKey(k))
const forgePublic = (k: KeyObject) => forge.pki.publicKeyFromPem(k.export({ type: 'spki', format: 'pem' }).toString())

function newCertificate(
  subject: string,
  publicKey: KeyObject,
  issuer: { name: forge.pki.CertificateField[], key: KeyObject },
  years: number,
  ca: boolean,
) {
  const cert = forge.pki.createCertificate()
  cert.publicKey = forgePublic(publicKey)
  cert.serialNumber = `01${randomBytes(15).toString('hex')}` // positive, 16 bytes
  cert.validity.notBefore = new Date(Date.now() - 60_000)
  cert.validity.notAfter = new Date(Date.now() + years * 365.25 * 86_400_000)
  const name = [{ name: 'commonName', value: subject }, { name: 'organizationName', value: 'Trapline installation' }]
  cert.setSubject(name)
  cert.setIssuer(issuer.name.length ? issuer.name : name)
  const usage = ca
    ? { keyCertSign: true, cRLSign: true }
    : { digitalSignature: true, nonRepudiation: true }
  cert.setExtensions([
    { name: 'basicConstraints', cA: ca, critical: ca },
    { name: 'keyUsage', ...usage, critical: true },
    { name: 'subjectKeyIdentifier' },
  ])
  cert.sign(forgeKey(issuer.key), forge.md.sha256.create())
  return { pem: forge.pki.certificateToPem(cert), subject: cert.subject.attributes as forge.pki.CertificateField[] }
}

const rsaPair = () => generateKeyPairSync('rsa', { modulusLength: 3072 })

/** The self-made certificate authority in `caDir`, made on first use (never replaces one). */
function useCa(caDir: string) {
  const certFile = join(caDir, CA_FILES.certificate)
  const keyFile = join(caDir, CA_FILES.key)
  if (!existsSync(certFile)) {
    mkdirSync(caDir, { recursive: true, mode: 0o700 })
    const pair = rsaPair()
    const self = { name: [], key: pair.privateKey }
    const made = newCertificate('Trapline seal authority (self-made)', pair.publicKey, self, 20, true)
    writeFileSync(keyFile, pemOfKey(pair.privateKey), { mode: 0o600, flag: 'wx' })
    writeFileSync(certFile, made.pem, { mode: 0o644, flag: 'wx' })
  }
  const pem = readFileSync(certFile, 'utf8')
  const name = forge.pki.certificateFromPem(pem).subject.attributes
  return { pem, key: createPrivateKey(readFileSync(keyFile, 'utf8')), name }
}

/**
 * Makes a new key set in `dir` (an Ed25519 key and a certificate issued by the self-made authority in
 * `caDir`). Refuses to overwrite: a key set already there is moved aside by `rotateKeySet` first.
 */
export function createKeySet(dir: string, caDir: string): SealKeys {
  mkdirSync(dir, { recursive: true, mode: 0o700 })
  const ca = useCa(caDir)
  const ed = generateKeyPairSync('ed25519')
  const rsa = rsaPair()
  const keyId = fingerprintOf(ed.publicKey)
  const leaf = newCertificate(`Trapline dossier seal ${keyId.slice(0, 19)}`, rsa.publicKey, ca, 5, false)
  writeFileSync(join(dir, KEY_FILES.ed25519), pemOfKey(ed.privateKey), { mode: 0o600, flag: 'wx' })
  writeFileSync(join(dir, KEY_FILES.certificateKey), pemOfKey(rsa.privateKey), { mode: 0o600, flag: 'wx' })
  writeFileSync(join(dir, KEY_FILES.certificate), leaf.pem + ca.pem, { mode: 0o644, flag: 'wx' })
  return readKeySet(dir)
}

/** Moves the current key set to `retired/<key id>/` beside it and makes a new one; returns both ids. */
export function rotateKeySet(dir: string, caDir: string) {
  const old = hasKeySet(dir) ? readKeySet(dir) : null
  if (old) {
    const aside = join(dir, 'retired', old.keyId.replaceAll(':', ''))
    mkdirSync(aside, { recursive: true, mode: 0o700 })
    for (const f of Object.values(KEY_FILES)) renameSync(join(dir, f), join(aside, f))
  }
  const made = createKeySet(dir, caDir)
  return { retired: old?.keyId ?? null, current: made.keyId }
}
