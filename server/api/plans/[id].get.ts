import { idParams } from '#shared/schemas/event-day'
import { planOf } from '#shared/rules/planner/request'

// A saved plan with its computation and the team's attempts to compare it with, for its team only.
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = validParams(event, idParams)
  const saved = await planFor(id, user.id)
  return { ...saved, computed: planOf(saved.input).plan, attempts: await teamAttempts(saved.teamId) }
})
