import { standingRecordSchema } from '#shared/schemas/event-day'

// The organiser's record book: the standing record per class and distance.
export default defineEventHandler(async (event) => {
  const { eventId } = await requireEventRole(event, ['organiser'])
  const input = await validBody(event, standingRecordSchema)
  input.className = await eventClassLabel(eventId, input.className)
  const [row] = await useDb()
    .insert(tables.standingRecords)
    .values({ ...input, eventId })
    .onConflictDoNothing()
    .returning()
  if (!row)
    throw createError({
      statusCode: 409,
      statusMessage: `A standing record for ${input.className} over ${input.distanceLabel} is already in the book`,
    })
  setResponseStatus(event, 201)
  return row
})
