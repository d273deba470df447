import { count, eq, inArray, sql } from 'drizzle-orm'

/** Courses and surveyed traps per event. */
function trapCounts(eventIds: number[]) {
  const { courses, traps } = tables
  return useDb()
    .select({
      eventId: courses.eventId,
      courses: sql<number>`count(distinct ${courses.id})::int`,
      traps: count(traps.id),
    })
    .from(courses)
    .leftJoin(traps, eq(traps.courseId, courses.id))
    .where(inArray(courses.eventId, eventIds))
    .groupBy(courses.eventId)
}

/** People per role and event, and how many of them have not yet accepted their invitation. */
function roleCounts(eventIds: number[]) {
  const { memberships, users } = tables
  return useDb()
    .select({
      eventId: memberships.eventId,
      role: memberships.role,
      people: count(),
      pending: sql<number>`count(*) filter (where ${users.passwordHash} is null)::int`,
    })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(inArray(memberships.eventId, eventIds))
    .groupBy(memberships.eventId, memberships.role)
}

function machineRows(eventIds: number[]) {
  const { teams, machines } = tables
  return useDb()
    .select({ eventId: teams.eventId, teamId: teams.id, team: teams.name, machine: machines.name })
    .from(machines)
    .innerJoin(teams, eq(teams.id, machines.teamId))
    .where(inArray(teams.eventId, eventIds))
}

function riderRows(eventIds: number[]) {
  const { events, teams, riders } = tables
  return useDb()
    .select({ teamId: riders.teamId, name: riders.name, licenceExpires: riders.licenceExpires, endsOn: events.endsOn })
    .from(riders)
    .innerJoin(teams, eq(teams.id, riders.teamId))
    .innerJoin(events, eq(events.id, teams.eventId))
    .where(inArray(teams.eventId, eventIds))
}

function entryRows(eventIds: number[]) {
  const { entries, machines } = tables
  return useDb()
    .select({ id: entries.id, eventId: entries.eventId, teamId: entries.teamId, machine: machines.name })
    .from(entries)
    .innerJoin(machines, eq(machines.id, entries.machineId))
    .where(inArray(entries.eventId, eventIds))
}

// A type, not an interface: the driver's row type must be an indexable record.
export type AttemptProgress = {
  id: number
  event_id: number
  team_id: number
  machine: string
  runs: number
  locked: boolean
  submitted: boolean
  decided: boolean
  dossiers: number
}

/** Each attempt's progress from runs to decision, newest first. */
async function attemptRows(eventIds: number[]) {
  if (!eventIds.length) return []
  const ids = sql.raw(`(${eventIds.map(Number).join(',')})`)
  const result = await useDb().execute<AttemptProgress>(sql`
    select a.id, a.event_id, e.team_id, m.name as machine,
      (select count(*)::int from runs r where r.attempt_id = a.id and r.status <> 'aborted') as runs,
      coalesce((
        select kind = 'timing-sheet' from signatures s
        where s.subject_id = a.id and s.kind in ('timing-sheet', 'timing-sheet-reopened')
        order by s.id desc limit 1
      ), false) as locked,
      exists (
        select 1 from submissions x join dossiers d on d.id = x.dossier_id where d.attempt_id = a.id
      ) as submitted,
      exists (
        select 1 from decisions x join dossiers d on d.id = x.dossier_id where d.attempt_id = a.id
      ) as decided,
      (select count(*)::int from dossiers d where d.attempt_id = a.id) as dossiers
    from attempts a join entries e on e.id = a.entry_id join machines m on m.id = e.machine_id
    where a.event_id in ${ids} order by a.id desc`)
  return result.rows
}

/** Everything the role homes of these events are made from, read once for all of them. */
export async function loadHomeFacts(eventIds: number[]) {
  if (!eventIds.length) {
    const clearance = await clearanceOf([])
    return { traps: [], roles: [], machines: [], riders: [], entries: [], attempts: [], clearance }
  }
  const [traps, roles, machines, riders, entries, attempts] = await Promise.all([
    trapCounts(eventIds),
    roleCounts(eventIds),
    machineRows(eventIds),
    riderRows(eventIds),
    entryRows(eventIds),
    attemptRows(eventIds),
  ])
  return { traps, roles, machines, riders, entries, attempts, clearance: await clearanceOf(entries.map(e => e.id)) }
}

export type HomeFacts = Awaited<ReturnType<typeof loadHomeFacts>>
