// A software passkey for the API tests: an ECDSA P-256 key pair that answers WebAuthn registration and
// signing challenges as an authenticator does (W3C Web Authentication Level 2: authenticator data,
// "none" attestation, client data JSON, ES256 signature over authenticatorData ‖ SHA-256(clientDataJSON)).
import { createHash, generateKeyPairSync, randomBytes, sign } from 'node:crypto'
import { isoBase64URL, isoCBOR } from '@simplewebauthn/server/helpers'

const b64 = (b: Uint8Array) => isoBase64URL.fromBuffer(b)
const sha256 = (b: Uint8Array | string) => createHash('sha256').update(b).digest()

export function softwarePasskey(origin: string) {
  const rpId = new URL(origin).hostname
  const { privateKey, publicKey } = generateKeyPairSync('ec', { namedCurve: 'P-256' })
  const jwk = publicKey.export({ format: 'jwk' }) as { x: string, y: string }
  const credentialId = randomBytes(16)
  let counter = 0
  const authData = (flags: number, attested?: Uint8Array) => {
    const count = Buffer.alloc(4)
    count.writeUInt32BE(++counter)
    return Buffer.concat([sha256(rpId), Buffer.from([flags]), count, ...(attested ? [attested] : [])])
  }
  const clientData = (type: string, challenge: string) =>
    Buffer.from(JSON.stringify({ type, challenge, origin, crossOrigin: false }))
  return {
    credentialId: b64(credentialId),
    /** The answer to registration options: "none" attestation with the COSE ES256 public key. */
    register(options: { challenge: string }) {
      const cose = isoCBOR.encode(new Map<number, number | Uint8Array>([
        [1, 2], [3, -7], [-1, 1], [-2, isoBase64URL.toBuffer(jwk.x)], [-3, isoBase64URL.toBuffer(jwk.y)],
      ]))
      const idLength = Buffer.alloc(2)
      idLength.writeUInt16BE(credentialId.length)
      const attested = Buffer.concat([Buffer.alloc(16), idLength, credentialId, Buffer.from(cose)])
      // Flags: user present (0x01), user verified (0x04), attested credential data (0x40).
      const attestationObject = isoCBOR.encode(new Map<string, unknown>([
        ['fmt', 'none'], ['attStmt', new Map()], ['authData', authData(0x45, attested)],
      ]))
      return {
        id: b64(credentialId),
        rawId: b64(credentialId),
        type: 'public-key' as const,
        response: {
          clientDataJSON: b64(clientData('webauthn.create', options.challenge)),
          attestationObject: b64(attestationObject),
          transports: ['internal'],
        },
        clientExtensionResults: {},
      }
    },
    /** The answer to signing options: the challenge (the content's digest) signed with the private key. */
    assert(options: { challenge: string }) {
      const data = authData(0x05)
      const client = clientData('webauthn.get', options.challenge)
      const signature = sign('sha256', Buffer.concat([data, sha256(client)]), privateKey)
      return {
        id: b64(credentialId),
        rawId: b64(credentialId),
        type: 'public-key' as const,
        response: {
          authenticatorData: b64(data),
          clientDataJSON: b64(client),
          signature: b64(signature),
        },
        clientExtensionResults: {},
      }
    },
  }
}
