import { setPasswordSchema } from '#shared/schemas/auth'

// public route: the holder of a single-use link sets a password and is signed in.
export default defineEventHandler(async (event) => {
  const { token, password, name } = await validBody(event, setPasswordSchema)
  const client = clientAddress(event)
  await spend(['tokenByClient', client])
  // The link is checked first: a wrong one costs no password hashing.
  await findUsableToken(token)
  const user = await spendToken(token, await hashPassword(password), name)
  await refund(['tokenByClient', client]) // only links that do not work use the limit up
  return { user: await signIn(event, user) }
})
