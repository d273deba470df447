import { createHash } from 'node:crypto'
import { and, eq, gt } from 'drizzle-orm'
import {
  generateAuthenticationOptions,
  generateRegistrationOptions,
  verifyAuthenticationResponse,
  verifyRegistrationResponse,
} from '@simplewebauthn/server'
import type { AuthenticationResponseJSON, RegistrationResponseJSON } from '@simplewebauthn/types'
import { isoBase64URL } from '@simplewebauthn/server/helpers'
import type { PasskeyAssertion } from '../../database/schema'

/** The relying party: the site's own host and origin, from its public address. */
function relyingParty() {
  const site = new URL(useRuntimeConfig().siteUrl)
  return { rpID: site.hostname, origin: site.origin, rpName: 'Trapline' }
}

/** A signed record's new id is not known when its passkey signs: the passkey signs the content without it. */
const OWN_ID_KEYS: Partial<Record<string, string>> = { statement: 'statement' }

/** The digest a passkey signs for a record: SHA-256 of its canonical content (its own new id left out). */
export function passkeyDigest(kind: string, content: unknown) {
  const key = OWN_ID_KEYS[kind]
  const signed = key && content && typeof content === 'object'
    ? Object.fromEntries(Object.entries(content).filter(([k]) => k !== key))
    : content
  return isoBase64URL.fromBuffer(createHash('sha256').update(canonicalJson(signed)).digest())
}

const mine = (userId: number) => useDb().select().from(tables.passkeys).where(eq(tables.passkeys.userId, userId))

export async function listPasskeys(userId: number) {
  const rows = await mine(userId)
  return rows.map(p => ({ id: p.id, name: p.name, createdAt: p.createdAt, credentialId: p.credentialId }))
}

/** Options for registering a new passkey; the challenge is kept for five minutes, once. */
export async function registrationOptions(user: { id: number, email: string, name: string }) {
  const { rpID, rpName } = relyingParty()
  const options = await generateRegistrationOptions({
    rpName,
    rpID,
    userName: user.email,
    userDisplayName: user.name,
    userID: new TextEncoder().encode(`trapline-user-${user.id}`),
    attestationType: 'none',
    excludeCredentials: (await mine(user.id)).map(p => ({ id: p.credentialId })),
    authenticatorSelection: { residentKey: 'preferred', userVerification: 'required' },
  })
  const values = { userId: user.id, challenge: options.challenge, expiresAt: new Date(Date.now() + 5 * 60_000) }
  await useDb().insert(tables.passkeyChallenges).values(values)
    .onConflictDoUpdate({ target: tables.passkeyChallenges.userId, set: values })
  return options
}

/** Checks a registration against the challenge given (once) and keeps the passkey's public key. */
export async function registerPasskey(userId: number, name: string, response: RegistrationResponseJSON) {
  const { rpID, origin } = relyingParty()
  const [challenge] = await useDb().delete(tables.passkeyChallenges)
    .where(and(eq(tables.passkeyChallenges.userId, userId), gt(tables.passkeyChallenges.expiresAt, new Date())))
    .returning()
  if (!challenge) throw conflict('Ask for a new passkey registration: the last one expired or was used')
  let verified
  try {
    verified = await verifyRegistrationResponse({
      response,
      expectedChallenge: challenge.challenge,
      expectedOrigin: origin,
      expectedRPID: rpID,
      requireUserVerification: true,
    })
  }
  catch (e) {
    throw fieldInvalid('response', `the passkey could not be registered: ${(e as Error).message}`)
  }
  if (!verified.verified || !verified.registrationInfo) throw fieldInvalid('response', 'the passkey was not verified')
  const { credential } = verified.registrationInfo
  const [row] = await useDb().insert(tables.passkeys).values({
    userId,
    credentialId: credential.id,
    publicKey: isoBase64URL.fromBuffer(credential.publicKey),
    counter: credential.counter,
    transports: credential.transports ?? [],
    name,
  }).onConflictDoNothing().returning()
  if (!row) throw conflict('This passkey is already registered')
  return { id: row.id, name: row.name, createdAt: row.createdAt }
}

/** Options for signing a record's content with one of the signer's passkeys: the challenge is its digest. */
export async function signingOptions(userId: number, digest: string) {
  const keys = await mine(userId)
  if (!keys.length) throw conflict('You have no passkey: register one on your account page, or sign with your password')
  return generateAuthenticationOptions({
    rpID: relyingParty().rpID,
    challenge: isoBase64URL.toBuffer(digest),
    allowCredentials: keys.map(k => ({ id: k.credentialId, transports: k.transports as never })),
    userVerification: 'required',
  })
}

/**
 * Checks that one of the signer's own passkeys signed exactly this digest (the content as stored now,
 * under the signing transaction's lock), and moves its counter on. Returns what is kept with the signature.
 */
export async function verifyPasskeySignature(
  tx: Tx,
  signerId: number,
  digest: string,
  response: AuthenticationResponseJSON,
): Promise<PasskeyAssertion> {
  const [key] = await tx.select().from(tables.passkeys)
    .where(and(eq(tables.passkeys.credentialId, response.id), eq(tables.passkeys.userId, signerId)))
    .for('update')
  if (!key) throw fieldInvalid('passkey', 'is not one of your passkeys; nothing was signed')
  const { rpID, origin } = relyingParty()
  let result
  try {
    result = await verifyAuthenticationResponse({
      response,
      expectedChallenge: digest,
      expectedOrigin: origin,
      expectedRPID: rpID,
      credential: { id: key.credentialId, publicKey: isoBase64URL.toBuffer(key.publicKey), counter: key.counter },
      requireUserVerification: true,
    })
  }
  catch (e) {
    const changed = /challenge/i.test((e as Error).message)
    throw fieldInvalid('passkey', changed
      ? 'signed other content than is stored now (it changed meanwhile); nothing was signed'
      : `could not be checked (${(e as Error).message}); nothing was signed`)
  }
  if (!result.verified) throw fieldInvalid('passkey', 'did not sign this content; nothing was signed')
  await tx.update(tables.passkeys).set({ counter: result.authenticationInfo.newCounter })
    .where(eq(tables.passkeys.id, key.id))
  return {
    credentialId: key.credentialId,
    authenticatorData: response.response.authenticatorData,
    clientDataJSON: response.response.clientDataJSON,
    signature: response.response.signature,
    userHandle: response.response.userHandle ?? null,
    challenge: digest,
  }
}

/**
 * Checks a stored assertion again, later, with the stored public key: that the passkey signed the
 * digest of the content the signature covers. The counter is not in question here.
 */
export async function assertionHolds(kind: string, content: unknown, a: PasskeyAssertion) {
  const [key] = await useDb().select().from(tables.passkeys).where(eq(tables.passkeys.credentialId, a.credentialId))
  if (!key) return false
  const { rpID, origin } = relyingParty()
  try {
    const r = await verifyAuthenticationResponse({
      response: {
        id: a.credentialId,
        rawId: a.credentialId,
        type: 'public-key',
        clientExtensionResults: {},
        response: {
          authenticatorData: a.authenticatorData,
          clientDataJSON: a.clientDataJSON,
          signature: a.signature,
          userHandle: a.userHandle ?? undefined,
        },
      },
      expectedChallenge: passkeyDigest(kind, content),
      expectedOrigin: origin,
      expectedRPID: rpID,
      credential: { id: key.credentialId, publicKey: isoBase64URL.toBuffer(key.publicKey), counter: 0 },
      requireUserVerification: true,
    })
    return r.verified
  }
  catch {
    return false
  }
}
