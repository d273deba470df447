import { eq } from 'drizzle-orm'
import { changePasswordSchema } from '#shared/schemas/auth'

export default defineEventHandler(async (event) => {
  const me = await requireUser(event)
  const { currentPassword, newPassword } = await validBody(event, changePasswordSchema)
  const [user] = await useDb().select().from(tables.users).where(eq(tables.users.id, me.id))
  if (!user?.passwordHash || !(await verifyPassword(user.passwordHash, currentPassword))) {
    throw fieldInvalid('currentPassword', 'is not your current password')
  }
  const passwordHash = await hashPassword(newPassword)
  // The new password spends every open reset or invitation link, and ends every session; this one goes on anew.
  const renewed = await useDb().transaction(async (tx) => {
    await tx.update(tables.users).set({ passwordHash, passwordChangedAt: new Date() }).where(eq(tables.users.id, me.id))
    await spendOpenLinks(tx, me.id)
    return endSessions(me.id, tx)
  })
  await signIn(event, renewed)
  return { ok: true }
})
