import { deviceImportSchema } from '#shared/schemas/device-import'

// A timing device's own file, already stored as a data log: without commit, the passings as they would be
// given to runs (and those no run can take); with it, those written, each naming the file.
export default defineEventHandler(async (event) => {
  const { eventId, user } = await requireEventRole(event, ['timekeeper'])
  const input = await validBody(event, deviceImportSchema)
  const result = await importDeviceFile(eventId, input, user.id)
  if (result.written) setResponseStatus(event, 201)
  return result
})
