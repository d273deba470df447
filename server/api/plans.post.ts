import { savedPlanSchema } from '#shared/schemas/planner'

// A team member saves a plan for their team (and one of its machines).
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const input = await validBody(event, savedPlanSchema)
  setResponseStatus(event, 201)
  return savePlan(input, user.id)
})
