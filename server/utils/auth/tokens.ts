import { createHash, randomBytes } from 'node:crypto'
import { and, eq, isNull } from 'drizzle-orm'

export const TOKEN_TTL_MS = { invite: 7 * 24 * 3600_000, reset: 3600_000 } as const
type Purpose = keyof typeof TOKEN_TTL_MS

const digest = (token: string) => createHash('sha256').update(token).digest('hex')

/** A single-use link token; only its SHA-256 is stored. */
export async function issueToken(userId: number, purpose: Purpose) {
  const token = randomBytes(32).toString('base64url')
  await useDb()
    .insert(tables.authTokens)
    .values({
      userId,
      purpose,
      tokenHash: digest(token),
      expiresAt: new Date(Date.now() + TOKEN_TTL_MS[purpose]),
    })
  return token
}

/** The unused token row with its user, or an error saying why the link does not work. */
export async function findUsableToken(token: string) {
  const [row] = await useDb()
    .select({ token: tables.authTokens, user: tables.users })
    .from(tables.authTokens)
    .innerJoin(tables.users, eq(tables.users.id, tables.authTokens.userId))
    .where(eq(tables.authTokens.tokenHash, digest(token)))
  if (!row) throw notFound('This link is not valid')
  if (row.token.usedAt) throw createError({ statusCode: 410, statusMessage: 'This link has already been used' })
  if (row.token.expiresAt.getTime() < Date.now())
    throw createError({ statusCode: 410, statusMessage: 'This link has expired; ask for a new one' })
  return row
}

/** Sets the password through a link; the token is spent in the same transaction. */
export async function spendToken(token: string, passwordHash: string, name?: string) {
  const row = await findUsableToken(token)
  return useDb().transaction(async (tx) => {
    const spent = await tx
      .update(tables.authTokens)
      .set({ usedAt: new Date() })
      .where(and(eq(tables.authTokens.id, row.token.id), isNull(tables.authTokens.usedAt)))
      .returning({ id: tables.authTokens.id })
    if (!spent.length) throw createError({ statusCode: 410, statusMessage: 'This link has already been used' })
    // A new password spends the person's other open links and ends every session they had.
    await spendOpenLinks(tx, row.user.id)
    await tx
      .update(tables.users)
      .set({ passwordHash, passwordChangedAt: new Date(), ...(name ? { name } : {}) })
      .where(eq(tables.users.id, row.user.id))
    return endSessions(row.user.id, tx)
  })
}

/** Every open invitation or reset link of the person is spent: after a new password, none of them sets one. */
export async function spendOpenLinks(db: Tx | Db, userId: number) {
  await db.update(tables.authTokens).set({ usedAt: new Date() })
    .where(and(eq(tables.authTokens.userId, userId), isNull(tables.authTokens.usedAt)))
}

export function linkFor(token: string) {
  return `${useRuntimeConfig().siteUrl.replace(/\/$/, '')}/set-password?token=${token}`
}
