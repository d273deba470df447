import { eq } from 'drizzle-orm'
import { changePasswordSchema } from '#shared/schemas/auth'

export default defineEventHandler(async (event) => {
  const me = await requireUser(event)
  const { currentPassword, newPassword } = await validBody(event, changePasswordSchema)
  const [user] = await useDb().select().from(tables.users).where(eq(tables.users.id, me.id))
  if (!user?.passwordHash || !(await verifyPassword(user.passwordHash, currentPassword))) {
    throw fieldInvalid('currentPassword', 'is not your current password')
  }
  await useDb()
    .update(tables.users)
    .set({ passwordHash: await hashPassword(newPassword), passwordChangedAt: new Date() })
    .where(eq(tables.users.id, me.id))
  // Every other session ends; this one goes on under the new version.
  await signIn(event, await endSessions(me.id))
  return { ok: true }
})
