import { eq } from 'drizzle-orm'
import { updateEventSchema } from '#shared/schemas/events'

export default defineEventHandler(async (event) => {
  const { eventId } = await requireEventRole(event, ['organiser'], { admin: true })
  const changes = await validBody(event, updateEventSchema)
  const [current] = await useDb().select().from(tables.events).where(eq(tables.events.id, eventId))
  const startsOn = changes.startsOn ?? current!.startsOn
  const endsOn = changes.endsOn ?? current!.endsOn
  if (endsOn < startsOn) throw invalidInput(updateEventSchema.safeParse({ startsOn, endsOn }).error!)
  if (!Object.keys(changes).length) return current!
  const [row] = await useDb().update(tables.events).set(changes).where(eq(tables.events.id, eventId)).returning()
  return row
})
