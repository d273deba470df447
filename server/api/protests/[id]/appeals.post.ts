import { appealSchema } from '#shared/schemas/protests'

// A party to a decided protest appeals, within the profile's deadline after the decision.
export default defineEventHandler(async (event) => {
  const { recordId, user, teamIds } = await requireRoleOn(event, 'protest', ['team'])
  const input = await validBody(event, appealSchema)
  setResponseStatus(event, 201)
  return lodgeAppeal(recordId, input, user, teamIds)
})
