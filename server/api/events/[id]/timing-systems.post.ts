import { timingSystemSchema } from '#shared/schemas/event-day'

export default defineEventHandler(async (event) => {
  const { eventId } = await requireEventRole(event, ['organiser'])
  const input = await validBody(event, timingSystemSchema)
  const [row] = await useDb()
    .insert(tables.timingSystems)
    .values({ ...input, ticksPerSecond: Number(input.ticksPerSecond), eventId })
    .onConflictDoNothing()
    .returning()
  if (!row)
    throw conflict(`This event already has a ${input.role} timing system`)
  setResponseStatus(event, 201)
  return row
})
