import { eq } from 'drizzle-orm'

// The event's permit and officials: who holds which function, and what the profile requires that nobody holds.
export default defineEventHandler(async (event) => {
  const { eventId } = await requireEventRole(event, 'any', { admin: true })
  const [ev] = await useDb().select({ profile: tables.events.profile }).from(tables.events)
    .where(eq(tables.events.id, eventId))
  const required = ev!.profile.appointments?.value ?? []
  return { required, ...(await officialsOf(eventId, required)) }
})
