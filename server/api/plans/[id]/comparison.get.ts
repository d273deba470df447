import { idParams } from '#shared/schemas/event-day'
import { comparisonQuerySchema } from '#shared/schemas/planner'

// The plan beside the measured runs of one of the team's attempts.
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = validParams(event, idParams)
  await planFor(id, user.id)
  const { attemptId } = validQuery(event, comparisonQuerySchema)
  return comparePlan(id, attemptId, user.id)
})
