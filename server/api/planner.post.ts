import { planInputSchema } from '#shared/schemas/planner'
import { planOf } from '#shared/rules/planner/request'

// public route: a plan is computed from the figures given, like the calculator; nothing is stored.
export default defineEventHandler(async (event) => {
  const request = await validBody(event, planInputSchema)
  const { plan, profile } = planOf(request)
  return { profile, plan }
})
