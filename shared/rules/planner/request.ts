// A plan request (as the form and the API send it) to the planner's input: the profile by its id.
import { profiles } from '../profiles'
import { plan, type PlanInput } from './plan'
import type { PlanRequest } from '../../schemas/planner'

export function planOf(r: PlanRequest) {
  const input: PlanInput = {
    machine: r.machine, conditions: r.conditions, course: r.course, shutdown: r.shutdown,
    profile: profiles[r.profileId], recordKmh: r.recordKmh, turnaroundMin: r.turnaroundMin,
  }
  return { input, plan: plan(input), profile: profiles[r.profileId].name }
}
