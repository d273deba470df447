import {
  createHash,
  createPrivateKey,
  createPublicKey,
  generateKeyPairSync,
  sign,
  verify,
  type KeyObject,
} from 'node:crypto'
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs'
import { join } from 'node:path'

let keys: { privateKey: KeyObject, publicKey: KeyObject, publicPem: string, fingerprint: string } | undefined

/** SHA-256 of the public key's DER form, in groups of four hex digits. */
export function fingerprintOf(publicKey: KeyObject) {
  const der = publicKey.export({ type: 'spki', format: 'der' })
  return createHash('sha256').update(der).digest('hex').match(/.{4}/g)!.join(':')
}

/** The server's Ed25519 sealing key, created on first start under the data folder, never committed. */
export function useSealKey() {
  if (!keys) {
    const file = join(dataDir(), 'seal-ed25519.pem')
    if (!existsSync(file)) {
      mkdirSync(dataDir(), { recursive: true })
      const pair = generateKeyPairSync('ed25519')
      writeFileSync(file, pair.privateKey.export({ type: 'pkcs8', format: 'pem' }), { mode: 0o600, flag: 'wx' })
    }
    const privateKey = createPrivateKey(readFileSync(file))
    const publicKey = createPublicKey(privateKey)
    keys = {
      privateKey,
      publicKey,
      publicPem: publicKey.export({ type: 'spki', format: 'pem' }).toString(),
      fingerprint: fingerprintOf(publicKey),
    }
  }
  return keys
}

/** Seals a manifest: Ed25519 over its SHA-256 (the 32 bytes), returned in base64. */
export function sealDigest(sha256Hex: string) {
  return sign(null, Buffer.from(sha256Hex, 'hex'), useSealKey().privateKey).toString('base64')
}

export function sealHolds(sha256Hex: string, sealBase64: string) {
  try {
    return verify(null, Buffer.from(sha256Hex, 'hex'), useSealKey().publicKey, Buffer.from(sealBase64, 'base64'))
  }
  catch {
    return false
  }
}
