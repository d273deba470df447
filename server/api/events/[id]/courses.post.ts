import { courseSchema } from '#shared/schemas/event-day'

export default defineEventHandler(async (event) => {
  const { eventId } = await requireEventRole(event, ['organiser'])
  const input = await validBody(event, courseSchema)
  const [course] = await useDb()
    .insert(tables.courses)
    .values({ ...input, eventId })
    .returning()
  setResponseStatus(event, 201)
  return course
})
