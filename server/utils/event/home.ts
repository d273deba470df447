import { and, count, eq, inArray, isNull, sql } from 'drizzle-orm'
import type { User } from '#auth-utils'
import type { EventRole } from '../../database/schema'

export interface Task {
  title: string
  detail: string
  href: string
  done: boolean
}

export interface RoleHome {
  eventId: number
  eventName: string
  role: EventRole
  teamName: string | null
  tasks: Task[]
}

/** What each of this person's roles has to do next, open tasks first. */
export async function homeFor(user: User) {
  const db = useDb()
  const { events, courses, traps, teams, machines, riders, memberships, users } = tables
  const mine = await membershipsOf(user.id)
  const eventIds = [...new Set(mine.map(m => m.eventId))]

  const trapCounts = eventIds.length
    ? await db
        .select({
          eventId: courses.eventId,
          courses: sql<number>`count(distinct ${courses.id})::int`,
          traps: count(traps.id),
        })
        .from(courses)
        .leftJoin(traps, eq(traps.courseId, courses.id))
        .where(inArray(courses.eventId, eventIds))
        .groupBy(courses.eventId)
    : []
  const roleCounts = eventIds.length
    ? await db
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
    : []
  const machineRows = eventIds.length
    ? await db
        .select({ eventId: teams.eventId, teamId: teams.id, team: teams.name, machine: machines.name })
        .from(machines)
        .innerJoin(teams, eq(teams.id, machines.teamId))
        .where(inArray(teams.eventId, eventIds))
    : []
  const riderRows = eventIds.length
    ? await db
        .select({
          teamId: riders.teamId,
          name: riders.name,
          licenceExpires: riders.licenceExpires,
          endsOn: events.endsOn,
        })
        .from(riders)
        .innerJoin(teams, eq(teams.id, riders.teamId))
        .innerJoin(events, eq(events.id, teams.eventId))
        .where(inArray(teams.eventId, eventIds))
    : []

  const entryRows = eventIds.length
    ? await db
        .select({
          id: tables.entries.id,
          eventId: tables.entries.eventId,
          teamId: tables.entries.teamId,
          machine: machines.name,
        })
        .from(tables.entries)
        .innerJoin(machines, eq(machines.id, tables.entries.machineId))
        .where(inArray(tables.entries.eventId, eventIds))
    : []
  const clearance = await clearanceOf(entryRows.map(e => e.id))
  const attemptRows = eventIds.length
    ? (
        await db.execute<{
          id: number
          event_id: number
          team_id: number
          machine: string
          runs: number
          locked: boolean
          submitted: boolean
          decided: boolean
          dossiers: number
        }>(sql`
      select a.id, a.event_id, e.team_id, m.name as machine,
        (select count(*)::int from runs r where r.attempt_id = a.id and r.status <> 'aborted') as runs,
        coalesce((select kind = 'timing-sheet' from signatures s where s.subject_id = a.id and s.kind in ('timing-sheet', 'timing-sheet-reopened') order by s.id desc limit 1), false) as locked,
        exists (select 1 from submissions x join dossiers d on d.id = x.dossier_id where d.attempt_id = a.id) as submitted,
        exists (select 1 from decisions x join dossiers d on d.id = x.dossier_id where d.attempt_id = a.id) as decided,
        (select count(*)::int from dossiers d where d.attempt_id = a.id) as dossiers
      from attempts a join entries e on e.id = a.entry_id join machines m on m.id = e.machine_id
      where a.event_id in ${sql.raw(`(${eventIds.map(Number).join(',')})`)} order by a.id desc`)
      ).rows
    : []

  const homes: RoleHome[] = mine.map((m) => {
    const at = `/events/${m.eventId}`
    const tc = trapCounts.find(t => t.eventId === m.eventId)
    const roles = roleCounts.filter(r => r.eventId === m.eventId)
    const held = (role: EventRole) => roles.find(r => r.role === role)?.people ?? 0
    const tasks: Task[] = []
    if (m.role === 'organiser') {
      tasks.push({
        title: 'Survey the course',
        detail: tc
          ? `${tc.courses} course(s), ${tc.traps} trap(s) at surveyed positions`
          : 'No course yet: set the course and its traps',
        href: at,
        done: !!tc && tc.traps >= 2,
      })
      for (const role of ['timekeeper', 'scrutineer', 'official'] as const) {
        tasks.push({
          title: `Name ${role === 'official' ? 'an' : 'a'} ${role}`,
          detail: held(role) ? `${held(role)} named` : `No ${role} yet`,
          href: `${at}/people`,
          done: held(role) > 0,
        })
      }
      const pending = roles.reduce((s, r) => s + r.pending, 0)
      tasks.push({
        title: 'Invitations accepted',
        detail: pending ? `${pending} invitation(s) not yet accepted` : 'Everyone invited has signed in',
        href: `${at}/people`,
        done: pending === 0,
      })
    }
    else if (m.role === 'timekeeper') {
      tasks.push({
        title: 'Run sheet',
        detail: tc ? `${tc.traps} trap(s) on the course` : 'The organiser has not set the course yet',
        href: `${at}/run-sheet`,
        done: !!tc,
      })
      for (const a of attemptRows.filter(x => x.event_id === m.eventId && x.runs >= 2)) {
        tasks.push({
          title: `Timing sheet of attempt #${a.id}`,
          detail: `${a.machine}: ${a.locked ? 'signed' : 'two runs in, to be signed'}`,
          href: `${at}/run-sheet`,
          done: a.locked,
        })
      }
    }
    else if (m.role === 'scrutineer') {
      const es = entryRows.filter(x => x.eventId === m.eventId)
      for (const e of es) {
        const c = clearance.get(e.id)!
        tasks.push({
          title: `Inspect ${e.machine}`,
          detail: c.cleared ? 'cleared to run' : c.why,
          href: c.inspectionId ? `/inspections/${c.inspectionId}` : `${at}/inspections`,
          done: c.cleared,
        })
      }
      if (!es.length)
        tasks.push({
          title: 'Inspect the machines',
          detail: 'No machine entered yet',
          href: `${at}/inspections`,
          done: false,
        })
    }
    else if (m.role === 'team') {
      for (const a of attemptRows.filter(x => x.event_id === m.eventId && x.team_id === m.teamId).slice(0, 3)) {
        tasks.push({
          title: `Dossier of attempt #${a.id}`,
          detail: `${a.machine}: ${a.decided ? 'decided by the officials' : a.submitted ? 'submitted, awaiting the officials' : a.dossiers ? 'sealed, not submitted' : `${a.runs} run(s); see what it still needs`}`,
          href: `/attempts/${a.id}/dossier`,
          done: a.submitted,
        })
      }
      const ms = machineRows.filter(x => x.teamId === m.teamId)
      tasks.push({
        title: 'Register the machine',
        detail: ms.length ? ms.map(x => x.machine).join(', ') : 'No machine registered yet',
        href: at,
        done: ms.length > 0,
      })
      const rs = riderRows.filter(r => r.teamId === m.teamId)
      for (const r of rs) {
        const valid = r.licenceExpires >= r.endsOn
        tasks.push({
          title: `Rider licence: ${r.name}`,
          detail: valid ? `valid until ${r.licenceExpires}` : `expires ${r.licenceExpires}, before the event ends`,
          href: at,
          done: valid,
        })
      }
      if (!rs.length) tasks.push({ title: 'Register the rider', detail: 'No rider yet', href: at, done: false })
    }
    else if (m.role === 'official') {
      for (const a of attemptRows.filter(x => x.event_id === m.eventId && x.submitted && !x.decided)) {
        tasks.push({
          title: `Decide on the dossier of attempt #${a.id}`,
          detail: `${a.machine}: submitted for ratification`,
          href: `/attempts/${a.id}/dossier`,
          done: false,
        })
      }
      const pairs = attemptRows.filter(x => x.event_id === m.eventId && x.runs >= 2 && !x.submitted)
      tasks.push({
        title: 'Witness statements',
        detail: pairs.length
          ? `${pairs.length} attempt(s) with a pair of runs not yet submitted`
          : 'No pair waiting',
        href: `${at}/statements`,
        done: !pairs.length,
      })
    }
    tasks.sort((a, b) => Number(a.done) - Number(b.done))
    return { eventId: m.eventId, eventName: m.eventName, role: m.role, teamName: m.teamName, tasks }
  })

  let admin: { eventsWithoutOrganiser: { id: number, name: string }[] } | null = null
  if (user.isAdmin) {
    const orphan = await db
      .select({ id: events.id, name: events.name })
      .from(events)
      .leftJoin(memberships, and(eq(memberships.eventId, events.id), eq(memberships.role, 'organiser')))
      .where(isNull(memberships.id))
    admin = { eventsWithoutOrganiser: orphan }
  }
  return { user, homes, admin }
}
