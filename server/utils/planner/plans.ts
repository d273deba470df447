import { and, desc, eq, inArray, isNotNull } from 'drizzle-orm'
import { planOf } from '#shared/rules/planner/request'
import type { SavedPlanInput } from '#shared/schemas/planner'

/** The teams a person enters for, at any event: whose plans they see and save. */
async function teamsOf(userId: number) {
  const rows = await useDb().selectDistinct({ teamId: tables.memberships.teamId }).from(tables.memberships)
    .where(and(eq(tables.memberships.userId, userId), eq(tables.memberships.role, 'team'),
      isNotNull(tables.memberships.teamId)))
  return rows.map(r => r.teamId!)
}

export async function plansOf(userId: number) {
  const teamIds = await teamsOf(userId)
  if (!teamIds.length) return []
  return useDb().select({ p: tables.plans, team: tables.teams.name, machine: tables.machines.name })
    .from(tables.plans)
    .innerJoin(tables.teams, eq(tables.teams.id, tables.plans.teamId))
    .leftJoin(tables.machines, eq(tables.machines.id, tables.plans.machineId))
    .where(inArray(tables.plans.teamId, teamIds)).orderBy(desc(tables.plans.updatedAt))
    .then(rows => rows.map(r => ({ ...r.p, team: r.team, machine: r.machine })))
}

/** A saved plan, for a member of its team only: anyone else is told there is no such plan. */
export async function planFor(id: number, userId: number) {
  const [row] = await useDb().select().from(tables.plans).where(eq(tables.plans.id, id))
  if (!row || !(await teamsOf(userId)).includes(row.teamId)) throw notFound('No such plan')
  return row
}

async function checkTeamAndMachine(input: SavedPlanInput, userId: number) {
  if (!(await teamsOf(userId)).includes(input.teamId)) throw fieldInvalid('teamId', 'is not a team you enter for')
  if (input.machineId) {
    const [m] = await useDb().select({ teamId: tables.machines.teamId }).from(tables.machines)
      .where(eq(tables.machines.id, input.machineId))
    if (m?.teamId !== input.teamId) throw fieldInvalid('machineId', 'is not a machine of this team')
  }
}

export async function savePlan(input: SavedPlanInput, userId: number) {
  await checkTeamAndMachine(input, userId)
  const [row] = await useDb().insert(tables.plans).values({
    teamId: input.teamId, machineId: input.machineId ?? null, name: input.name, input: input.input, createdBy: userId,
  }).returning()
  return row!
}

export async function updatePlan(id: number, input: SavedPlanInput, userId: number) {
  await planFor(id, userId)
  await checkTeamAndMachine(input, userId)
  const [row] = await useDb().update(tables.plans).set({
    teamId: input.teamId, machineId: input.machineId ?? null, name: input.name, input: input.input,
    updatedAt: new Date(),
  }).where(eq(tables.plans.id, id)).returning()
  return row!
}

/** The team's attempts, newest first: what a plan can be compared with. */
export async function teamAttempts(teamId: number) {
  return useDb().select({ id: tables.attempts.id, event: tables.events.name, machine: tables.machines.name })
    .from(tables.attempts)
    .innerJoin(tables.entries, eq(tables.entries.id, tables.attempts.entryId))
    .innerJoin(tables.events, eq(tables.events.id, tables.attempts.eventId))
    .innerJoin(tables.machines, eq(tables.machines.id, tables.entries.machineId))
    .where(eq(tables.entries.teamId, teamId)).orderBy(desc(tables.attempts.id))
}

/**
 * The plan beside what happened: the speed each run of an attempt of the plan's team made over its main
 * distance, and the attempt's result, against the plan's speed in that direction and its two-way result.
 */
export async function comparePlan(id: number, attemptId: number, userId: number) {
  const saved = await planFor(id, userId)
  const [attempt] = await useDb().select({ eventId: tables.attempts.eventId, teamId: tables.entries.teamId })
    .from(tables.attempts).innerJoin(tables.entries, eq(tables.entries.id, tables.attempts.entryId))
    .where(eq(tables.attempts.id, attemptId))
  if (!attempt || attempt.teamId !== saved.teamId) throw fieldInvalid('attemptId', 'is not an attempt of this team')
  const live = computeLive(await loadEventDay(attempt.eventId)).find(a => a.id === attemptId)!
  const { plan } = planOf(saved.input)
  const planned = { out: plan.runs[0]!.speedKmh, back: plan.runs[1]!.speedKmh }
  return {
    distance: live.entry.distanceLabel,
    planned: { ...planned, resultKmh: plan.result.kmh },
    runs: live.runs.filter(r => r.status !== 'aborted').map(r => ({
      id: r.id,
      direction: r.direction,
      measuredKmh: r.official ? Number(r.official.kmh) : null,
      plannedKmh: planned[r.direction],
    })),
    resultKmh: live.result ? Number(live.result.kmh) : null,
  }
}
