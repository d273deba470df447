import { z } from 'zod'
import { DECISIONS } from '../constants'
import { recordId } from './fields'
import { runIdsSeen } from './inspection'

const base64url = z.string().regex(/^[A-Za-z0-9_-]*$/, { error: 'must be base64url' }).max(20_000)

/** The browser's answer to a registration (a WebAuthn attestation as the browser library returns it). */
export const passkeyRegistrationSchema = z.object({
  name: z.string().trim().min(1, { error: 'name the device, e.g. "timing hut laptop"' }).max(80),
  /** The account's password: a session alone never adds a way to sign in the person's name. */
  password: z.string().min(1, { error: 'type your password to add a passkey' }).max(200),
  response: z.object({
    id: base64url.min(1),
    rawId: base64url.min(1),
    type: z.literal('public-key'),
    response: z.object({
      clientDataJSON: base64url.min(1),
      attestationObject: base64url.min(1),
      transports: z.array(z.string().max(20)).max(10).optional(),
      authenticatorData: base64url.optional(),
      publicKey: base64url.optional(),
      publicKeyAlgorithm: z.number().int().optional(),
    }),
    clientExtensionResults: z.record(z.string(), z.unknown()).default({}),
    authenticatorAttachment: z.enum(['platform', 'cross-platform']).optional(),
  }),
})
export type PasskeyRegistrationInput = z.infer<typeof passkeyRegistrationSchema>

/** The owner revokes a passkey, with the password and a reason. */
export const passkeyRevocationSchema = z.object({
  password: z.string().min(1, { error: 'type your password to revoke a passkey' }).max(200),
  reason: z.string().trim().min(3, { error: 'say why (a lost phone, a borrowed laptop)' }).max(300),
})

/** What a statement will say, so that a passkey can sign it before it is written. */
export const statementDraftSchema = z.object({
  attemptId: recordId,
  runIdsSeen,
  runsSeen: z.string().trim().max(500),
  position: z.string().trim().max(300),
  conditions: z.string().trim().max(1000),
  irregularities: z.string().trim().max(2000).default(''),
})

/** What a decision will say, so that a passkey can sign it before it is written. */
export const decisionDraftSchema = z.object({
  decision: z.enum(DECISIONS, { error: 'must be ratified or refused' }),
  reasons: z.string().trim().max(4000),
})
