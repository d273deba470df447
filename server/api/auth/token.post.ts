import { setPasswordSchema } from '#shared/schemas/auth'

// public route: the holder of a single-use link sets a password and is signed in.
export default defineEventHandler(async (event) => {
  const { token, password, name } = await validBody(event, setPasswordSchema)
  const user = await spendToken(token, await hashPassword(password), name)
  return { user: await signIn(event, user) }
})
