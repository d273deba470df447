import { tokenQuerySchema } from '#shared/schemas/auth'

// public route: what an invitation or reset link is for, before the person sets a password.
export default defineEventHandler(async (event) => {
  const { token } = validQuery(event, tokenQuerySchema)
  const row = await findUsableToken(token)
  return { purpose: row.token.purpose, email: row.user.email, name: row.user.name, expiresAt: row.token.expiresAt }
})
