import { changeDecisionSchema } from '#shared/schemas/event-day'

// The organiser approves (the change is written, with its history) or refuses a team's entry change request.
export default defineEventHandler(async (event) => {
  const { recordId, user } = await requireRoleOn(event, 'changeRequest', ['organiser'])
  const input = await validBody(event, changeDecisionSchema)
  return decideEntryChange(recordId, input, user.id)
})
