// public route: every key that seals dossiers here, current and retired, to check a seal without Trapline.
export default defineEventHandler(async () => {
  const key = useSealKey()
  const keys = await sealKeyring()
  return {
    algorithm: 'Ed25519',
    signs: 'the SHA-256 of manifest.json (32 bytes); the PDF itself carries a standard signature (ETSI.CAdES.detached) '
      + 'by the key\'s certificate',
    fingerprint: key.keyId,
    publicKeyPem: key.publicPem,
    certificatePem: [key.certificatePem, ...key.chainPem].join('\n'),
    keys: keys.map(k => ({
      keyId: k.keyId,
      publicKeyPem: k.publicKeyPem,
      certificatePem: k.certificatePem,
      certificateSha256: k.certificateSha256,
      firstUsedAt: k.firstUsedAt,
      retiredAt: k.retiredAt,
    })),
  }
})
