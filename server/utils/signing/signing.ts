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
export async function insertSignature(
  tx: Tx,
  input: {
    kind: Kind
    subjectId: number
    eventId: number
    signerId: number
    typedName: string
    content: unknown
    drawingPng?: string | null
    reason?: string | null
    supersedesId?: number | null
    /** Only for the demo's seed, which signs on its own calendar; otherwise the database's clock. */
    signedAt?: Date
  },
) {
  const [row] = await tx
    .insert(tables.signatures)
    .values({
      kind: input.kind,
      subjectId: input.subjectId,
      eventId: input.eventId,
      signerId: input.signerId,
      typedName: input.typedName,
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

/** The content each signature signed, as stored beside it. */
export async function signedContents(ids: number[]) {
  if (!ids.length) return new Map<number, unknown>()
  const rows = await useDb()
    .select({ id: tables.signatures.id, content: tables.signatures.content })
    .from(tables.signatures)
    .where(inArray(tables.signatures.id, ids))
  return new Map(rows.map(r => [r.id, r.content]))
}
