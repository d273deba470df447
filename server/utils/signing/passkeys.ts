import { createHash, randomBytes } from 'node:crypto'
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

/** The person's passkeys, with their revocation where there is one. */
const allMine = (userId: number) => useDb()
  .select({ p: tables.passkeys, revokedAt: tables.passkeyRevocations.revokedAt })
  .from(tables.passkeys)
  .leftJoin(tables.passkeyRevocations, eq(tables.passkeyRevocations.passkeyId, tables.passkeys.id))
  .where(eq(tables.passkeys.userId, userId))

/** The person's passkeys that may still sign: not revoked. */
const mine = async (userId: number) => (await allMine(userId)).filter(r => !r.revokedAt).map(r => r.p)

export async function listPasskeys(userId: number) {
  const rows = await allMine(userId)
  return rows.map(({ p, revokedAt }) =>
    ({ id: p.id, name: p.name, createdAt: p.createdAt, credentialId: p.credentialId, revokedAt }))
}

/** The challenge a passkey signs: SHA-256 of the content's digest and the server's single-use nonce, base64url. */
const challengeOf = (digest: string, nonce: string) =>
  isoBase64URL.fromBuffer(createHash('sha256').update(`${digest}.${nonce}`).digest())

/**
 * The owner revokes a passkey (a lost phone, a borrowed laptop): it signs nothing from then on; the signatures it
 * made stay checkable with its public key, kept. Confirmed with the password; the owner is mailed.
 */
export async function revokePasskey(user: { id: number, email: string }, passkeyId: number, reason: string) {
  const [key] = await useDb().select().from(tables.passkeys)
    .where(and(eq(tables.passkeys.id, passkeyId), eq(tables.passkeys.userId, user.id)))
  if (!key) throw notFound('No such passkey')
  const [row] = await useDb().insert(tables.passkeyRevocations).values({ passkeyId, reason })
    .onConflictDoNothing().returning()
  if (!row) throw conflict('This passkey is already revoked')
  await queueMail([{
    to: user.email,
    subject: `Trapline: passkey "${key.name}" revoked`,
    text: `The passkey "${key.name}" of your account was revoked: it signs nothing more. Reason given: ${reason}\n`
      + 'What it signed before stays checkable. If you did not do this, change your password now.\n',
  }], { wait: false })
  return row
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

/**
 * Checks a registration against the challenge given (once) and keeps the passkey's public key. The caller has
 * checked the password: a session alone never adds a way to sign. The owner is mailed.
 */
export async function registerPasskey(user: { id: number, email: string }, name: string,
  response: RegistrationResponseJSON) {
  const userId = user.id
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
  await queueMail([{
    to: user.email,
    subject: `Trapline: passkey "${name}" added`,
    text: `A passkey named "${name}" was added to your account: it can sign in your name. If you did not add it, `
      + 'revoke it on your account page and change your password now.\n',
  }], { wait: false })
  return { id: row.id, name: row.name, createdAt: row.createdAt }
}

/**
 * Options for signing a record's content with one of the signer's passkeys. The server issues the challenge:
 * random, for this signer and this act over this content's digest, good once for five minutes.
 */
export async function signingOptions(userId: number, kind: string, digest: string) {
  const keys = await mine(userId)
  if (!keys.length) throw conflict('You have no passkey: register one on your account page, or sign with your password')
  const nonce = randomBytes(16).toString('base64url')
  const challenge = challengeOf(digest, nonce)
  await useDb().insert(tables.signingChallenges)
    .values({ userId, kind, digest, nonce, challenge, expiresAt: new Date(Date.now() + 5 * 60_000) })
  return generateAuthenticationOptions({
    rpID: relyingParty().rpID,
    challenge: isoBase64URL.toBuffer(challenge),
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
  kind: string,
  digest: string,
  response: AuthenticationResponseJSON,
): Promise<PasskeyAssertion> {
  const [key] = await tx.select().from(tables.passkeys)
    .where(and(eq(tables.passkeys.credentialId, response.id), eq(tables.passkeys.userId, signerId)))
    .for('update')
  if (!key) throw fieldInvalid('passkey', 'is not one of your passkeys; nothing was signed')
  const [revoked] = await tx.select().from(tables.passkeyRevocations)
    .where(eq(tables.passkeyRevocations.passkeyId, key.id))
  if (revoked) throw fieldInvalid('passkey', 'was revoked; nothing was signed')
  const issued = await issuedChallenge(tx, signerId, kind, digest, response)
  const { rpID, origin } = relyingParty()
  let result
  try {
    result = await verifyAuthenticationResponse({
      response,
      expectedChallenge: issued.challenge,
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
  await tx.update(tables.signingChallenges).set({ usedAt: new Date() })
    .where(eq(tables.signingChallenges.id, issued.id))
  return {
    credentialId: key.credentialId,
    authenticatorData: response.response.authenticatorData,
    clientDataJSON: response.response.clientDataJSON,
    signature: response.response.signature,
    userHandle: response.response.userHandle ?? null,
    challenge: issued.challenge,
    nonce: issued.nonce,
  }
}

/**
 * The challenge the answer signed, as this server issued it: to this signer, for this act, over the content as it
 * is stored now, unused and within its five minutes. Locked, so it is spent once.
 */
async function issuedChallenge(tx: Tx, signerId: number, kind: string, digest: string,
  response: AuthenticationResponseJSON) {
  let signed = ''
  try {
    signed = JSON.parse(Buffer.from(response.response.clientDataJSON, 'base64url').toString('utf8')).challenge ?? ''
  }
  catch {
    throw fieldInvalid('passkey', 'is not a passkey\'s answer (its client data cannot be read); nothing was signed')
  }
  const [issued] = await tx.select().from(tables.signingChallenges)
    .where(and(eq(tables.signingChallenges.challenge, signed), eq(tables.signingChallenges.userId, signerId)))
    .for('update')
  const refuse = (why: string) => fieldInvalid('passkey', `${why}; nothing was signed`)
  if (!issued) throw refuse('answers a challenge this server did not issue to you')
  if (issued.usedAt) throw refuse('answers a challenge already used: a passkey\'s answer counts once')
  if (issued.expiresAt.getTime() < Date.now()) throw refuse('answers a challenge that has expired: sign again')
  if (issued.kind !== kind) throw refuse(`answers a challenge issued for another act (${issued.kind})`)
  if (issued.digest !== digest) throw refuse('signed other content than is stored now (it changed meanwhile)')
  return issued
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
      expectedChallenge: a.nonce
        ? challengeOf(passkeyDigest(kind, content), a.nonce)
        : passkeyDigest(kind, content),
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
