import { overrideSchema } from '#shared/schemas/officials'

// The clerk of the course lets an entry start over named start-line findings for the day, with a signed reason.
export default defineEventHandler(async (event) => {
  const { recordId, user } = await requireRoleOn(event, 'entry', ['official', 'organiser'])
  const input = await validBody(event, overrideSchema)
  setResponseStatus(event, 201)
  return overrideStartLine(recordId, input, user)
})
