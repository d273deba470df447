import { entryDetailsSchema } from '#shared/schemas/event-day'

// A team corrects its own entry (rider, licence, machine): at once before the first run, else as a request
// the organiser decides.
export default defineEventHandler(async (event) => {
  const { recordId, teamIds, user } = await requireRoleOn(event, 'entry', ['team'])
  const input = await validBody(event, entryDetailsSchema)
  return changeEntry(recordId, teamIds, input, user.id)
})
