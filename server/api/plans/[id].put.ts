import { idParams } from '#shared/schemas/event-day'
import { savedPlanSchema } from '#shared/schemas/planner'

// The team changes a saved plan (a plan is the team's working estimate, not a signed record).
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = validParams(event, idParams)
  await planFor(id, user.id)
  const input = await validBody(event, savedPlanSchema)
  return updatePlan(id, input, user.id)
})
