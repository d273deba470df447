// public route: the key that seals dossiers, to check a seal without Trapline.
export default defineEventHandler(() => {
  const key = useSealKey()
  return {
    algorithm: 'Ed25519',
    signs: 'the SHA-256 of manifest.json (32 bytes)',
    fingerprint: key.fingerprint,
    publicKeyPem: key.publicPem,
  }
})
