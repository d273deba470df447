import { eq } from 'drizzle-orm'

// Entries with their clearance; a team sees its own entries only.
export default defineEventHandler(async (event) => {
  const access = await requireEventRole(event, 'any', { admin: true })
  const { eventId, teamIds } = access
  const teamOnly = actsAsTeamOnly(access)
  const rows = await useDb()
    .select({
      entry: tables.entries,
      machine: tables.machines.name,
      power: tables.machines.power,
      rider: tables.riders.name,
      team: tables.teams.name,
    })
    .from(tables.entries)
    .innerJoin(tables.machines, eq(tables.machines.id, tables.entries.machineId))
    .innerJoin(tables.riders, eq(tables.riders.id, tables.entries.riderId))
    .innerJoin(tables.teams, eq(tables.teams.id, tables.entries.teamId))
    .where(eq(tables.entries.eventId, eventId))
  const visible = rows.filter(r => !teamOnly || teamIds.includes(r.entry.teamId))
  const clearance = await clearanceOf(visible.map(r => r.entry.id))
  return visible.map(r => ({
    id: r.entry.id,
    className: r.entry.className,
    machine: r.machine,
    machineId: r.entry.machineId,
    power: r.power,
    rider: r.rider,
    team: r.team,
    teamId: r.entry.teamId,
    ...clearance.get(r.entry.id)!,
  }))
})
