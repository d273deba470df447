import { createPublicKey, sign, X509Certificate } from 'node:crypto'
import { existsSync, readFileSync } from 'node:fs'
import { join, resolve } from 'node:path'
import { and, isNull, ne } from 'drizzle-orm'
import {
  createKeySet,
  fingerprintOf,
  hasKeySet,
  keysFromPem,
  readKeySet,
  type SealKeys,
} from './seal-keys'

let current: SealKeys | undefined
let preparing: Promise<SealKeys> | undefined

/** Resolves once the start has loaded (or, on a first start, made) the seal's key set. */
export const sealKeysReady = () => (preparing ??= prepareSealKeys())

/** The folder of the seal's key set: configured, or `<dataDir>/seal`. */
export const sealDir = () => resolve(useRuntimeConfig().sealDir || join(dataDir(), 'seal'))

/** The key set as configured: PEM texts from the environment, or the files of the seal folder. */
function configuredKeys(): SealKeys | null {
  const c = useRuntimeConfig()
  if (c.sealEd25519Pem) {
    return keysFromPem({
      ed25519: c.sealEd25519Pem,
      certificate: c.sealCertificatePem,
      certificateKey: c.sealCertificateKeyPem,
    })
  }
  return hasKeySet(sealDir()) ? readKeySet(sealDir()) : null
}

/**
 * At start: the configured key set, registered with its public parts. A first start of an installation
 * with no key configured makes one (and a self-made certificate authority for it); a server that finds
 * no key where one is expected (a folder or texts configured, or keys used before) refuses to start.
 */
async function prepareSealKeys() {
  let keys = configuredKeys()
  if (!keys) {
    const used = await useDb().select({ keyId: tables.sealKeys.keyId }).from(tables.sealKeys).limit(1)
    if (used.length || useRuntimeConfig().sealDir) {
      throw new Error(`no seal key in ${sealDir()}: dossiers were sealed here before (key ${used[0]?.keyId ?? '?'}) `
        + 'or a key folder is configured; restore the key set, or point NUXT_SEAL_DIR at the shared one')
    }
    keys = createKeySet(sealDir(), join(sealDir(), 'authority'))
    await registerLegacyKey()
  }
  const certificateSha256 = new X509Certificate(keys.certificatePem).fingerprint256.replaceAll(':', '').toLowerCase()
  await useDb().transaction(async (tx) => {
    await tx.insert(tables.sealKeys).values({
      keyId: keys.keyId,
      publicKeyPem: keys.publicPem,
      certificatePem: [keys.certificatePem, ...keys.chainPem].join('\n'),
      certificateSha256,
    }).onConflictDoNothing()
    await tx.update(tables.sealKeys).set({ retiredAt: new Date() })
      .where(and(ne(tables.sealKeys.keyId, keys.keyId), isNull(tables.sealKeys.retiredAt)))
  })
  current = keys
  return keys
}

/** A key from before key sets (`<dataDir>/seal-ed25519.pem`) is kept as retired, so its dossiers verify. */
async function registerLegacyKey() {
  const file = join(dataDir(), 'seal-ed25519.pem')
  if (!existsSync(file)) return
  const publicKey = createPublicKey(readFileSync(file))
  await useDb().insert(tables.sealKeys).values({
    keyId: fingerprintOf(publicKey),
    publicKeyPem: publicKey.export({ type: 'spki', format: 'pem' }).toString(),
    retiredAt: new Date(),
  }).onConflictDoNothing()
}

/** The current key set (read by the start; a server without one has refused to start). */
export function useSealKey(): SealKeys & { fingerprint: string } {
  current ??= configuredKeys() ?? undefined
  if (!current) throw new Error('the seal key set is not loaded')
  return { ...current, fingerprint: current.keyId }
}

/** Every key that ever sealed here, current first. */
export async function sealKeyring() {
  const rows = await useDb().select().from(tables.sealKeys)
  return rows.sort((a, b) => Number(!!a.retiredAt) - Number(!!b.retiredAt) || +b.firstUsedAt - +a.firstUsedAt)
}

/** Seals a manifest: Ed25519 over its SHA-256 (the 32 bytes), returned in base64. */
export function sealDigest(sha256Hex: string) {
  return sign(null, Buffer.from(sha256Hex, 'hex'), useSealKey().privateKey).toString('base64')
}
