// The signed-in person's passkeys (names and dates; the public keys stay on the server).
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  return listPasskeys(user.id)
})
