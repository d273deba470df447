import { abortSchema } from '#shared/schemas/event-day'

export default defineEventHandler(async (event) => {
  const { recordId, user } = await requireRoleOn(event, 'run', ['timekeeper'])
  const input = await validBody(event, abortSchema)
  return abortRun(recordId, input, user.id)
})
