import type { AuthenticationResponseJSON } from '@simplewebauthn/types'
import { createHash } from 'node:crypto'
import { eq, inArray } from 'drizzle-orm'

type Kind = (typeof tables.signatures.$inferInsert)['kind']

export const sha256 = (text: string) => createHash('sha256').update(text).digest('hex')

/** Signing asks for the password again: a wrong one signs nothing. */
export async function assertPassword(userId: number, password: string) {
  const [user] = await useDb().select().from(tables.users).where(eq(tables.users.id, userId))
  if (!user?.passwordHash || !(await verifyPassword(user.passwordHash, password))) {
    throw fieldInvalid('password', 'is not your password; nothing was signed')
  }
}

/**
 * The one signing mechanism: who, when, the typed name, an optional drawn signature, and the
 * SHA-256 of the record's canonical content, kept beside the content. The row is append-only.
 */
/** How a signer proved it was them: the password again (checked before), or a passkey (checked with the content). */
export type SignerProof = { method: 'password' } | { method: 'passkey', response: AuthenticationResponseJSON }
  /** Signed in person on the device of the signed-in witness (a briefing sign-on on the organiser's tablet). */
  | { method: 'in-person' }

/** The signer's proof: a passkey's response is checked later against the content; a password here and now. */
export async function signerProof(
  userId: number,
  input: { password?: string, passkey?: AuthenticationResponseJSON },
): Promise<SignerProof> {
  if (input.passkey) return { method: 'passkey', response: input.passkey }
  if (!input.password) throw fieldInvalid('password', 'enter your password again, or sign with your passkey')
  await assertPassword(userId, input.password)
  return { method: 'password' }
}

export async function insertSignature(
  tx: Tx,
  input: {
    proof: SignerProof
    kind: Kind
    subjectId: number
    eventId: number
    signerId: number
    typedName: string
    /** Why the typed name differs from the name on the account; required where it does. */
    nameNote?: string | null
    /** The name the typed one must match, where the signer signs as another named person (a rider). */
    nameOnFile?: string
    content: unknown
    drawingPng?: string | null
    reason?: string | null
    supersedesId?: number | null
    /** Only for the demo's seed, which signs on its own calendar; otherwise the database's clock. */
    signedAt?: Date
  },
) {
  await assertSignerName(tx, input.signerId, input.typedName, input.nameNote, input.nameOnFile)
  // A passkey signs the SHA-256 of exactly this content: checked here, under the caller's lock.
  const assertion = input.proof.method === 'passkey'
    ? await verifyPasskeySignature(tx, input.signerId, input.kind, passkeyDigest(input.kind, input.content),
        input.proof.response)
    : null
  const [row] = await tx
    .insert(tables.signatures)
    .values({
      method: input.proof.method,
      assertion,
      kind: input.kind,
      subjectId: input.subjectId,
      eventId: input.eventId,
      signerId: input.signerId,
      typedName: input.typedName,
      nameNote: input.nameNote?.trim() || null,
      content: input.content,
      contentSha256: sha256(canonicalJson(input.content)),
      drawingPng: input.drawingPng ?? null,
      reason: input.reason ?? null,
      supersedesId: input.supersedesId ?? null,
      ...(input.signedAt ? { signedAt: input.signedAt } : {}),
    })
    .returning()
  return row!
}

/**
 * The typed name is the signer's name on file (case and spacing aside), or the signer says why it differs
 * (a name as on a licence, a married name): a signature is a deliberate act by a named person.
 */
async function assertSignerName(tx: Tx, signerId: number, typedName: string, nameNote?: string | null,
  nameOnFile?: string) {
  const [user] = await tx.select({ name: tables.users.name }).from(tables.users).where(eq(tables.users.id, signerId))
  const onFile = nameOnFile ?? user?.name
  if (!onFile || sameName(typedName, onFile) || (nameNote?.trim().length ?? 0) >= 3) return
  throw fieldInvalid('typedName', `is not the name on ${nameOnFile ? 'file' : 'your account'} (${onFile}): `
    + 'type it as on file, or say why it differs; nothing was signed')
}

/** The content each signature signed, as stored beside it. */
export async function signedContents(ids: number[]) {
  if (!ids.length) return new Map<number, unknown>()
  const rows = await useDb()
    .select({ id: tables.signatures.id, content: tables.signatures.content })
    .from(tables.signatures)
    .where(inArray(tables.signatures.id, ids))
  return new Map(rows.map(r => [r.id, r.content]))
}
