import { trapSchema } from '#shared/schemas/event-day'

export default defineEventHandler(async (event) => {
  const { eventId } = await requireEventRole(event, ['organiser'])
  const input = await validBody(event, trapSchema)
  await courseOf(eventId, input.courseId)
  const [trap] = await useDb().insert(tables.traps).values(input).onConflictDoNothing().returning()
  if (!trap)
    throw conflict(`This course already has a trap called ${input.label}`)
  setResponseStatus(event, 201)
  return trap
})
