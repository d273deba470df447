import { eq } from 'drizzle-orm'
import { loginSchema } from '#shared/schemas/auth'

let decoyHash: Promise<string> | undefined

// public route: sign-in with e-mail and password.
export default defineEventHandler(async (event) => {
  const { email, password } = await validBody(event, loginSchema)
  const guesses = await spendSignIn(event, email)
  const [user] = await useDb().select().from(tables.users).where(eq(tables.users.email, email))
  // An unknown address costs the same time as a wrong password, so neither is revealed.
  decoyHash ??= hashPassword('decoy password that never matches')
  const ok = user?.passwordHash
    ? await verifyPassword(user.passwordHash, password)
    : (await verifyPassword(await decoyHash, password), false)
  await recordLoginAttempt(email, ok)
  if (!ok || !user) throw createError({ statusCode: 401, statusMessage: 'Wrong e-mail address or password' })
  await guesses.cleared()
  return { user: await signIn(event, user) }
})
