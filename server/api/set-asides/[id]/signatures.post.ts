import { signSheetSchema } from '#shared/schemas/event-day'

// Another appointed steward signs a proposed set-aside: it takes effect once the profile's quorum has signed.
export default defineEventHandler(async (event) => {
  const { recordId, user } = await requireRoleOn(event, 'setAside', ['official', 'timekeeper'])
  const input = await validBody(event, signSheetSchema)
  const row = await cosignSetAside(recordId, input, user)
  setResponseStatus(event, 201)
  return row
})
