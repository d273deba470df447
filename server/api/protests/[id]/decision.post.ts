import { protestDecisionSchema } from '#shared/schemas/protests'

// A steward records the hearing and decides a protest (an official records an appeal body's decision), signed.
export default defineEventHandler(async (event) => {
  const { recordId, user, roles } = await requireRoleOn(event, 'protest', ['official', 'organiser'])
  const input = await validBody(event, protestDecisionSchema)
  setResponseStatus(event, 201)
  return decideProtest(recordId, input, user, roles)
})
