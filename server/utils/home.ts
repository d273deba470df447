import { and, count, eq, inArray, isNull, sql } from 'drizzle-orm'
import type { User } from '#auth-utils'
import type { EventRole } from '../database/schema'

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
    ? await db.select({ eventId: courses.eventId, courses: sql<number>`count(distinct ${courses.id})::int`, traps: count(traps.id) })
      .from(courses).leftJoin(traps, eq(traps.courseId, courses.id)).where(inArray(courses.eventId, eventIds)).groupBy(courses.eventId)
    : []
  const roleCounts = eventIds.length
    ? await db.select({ eventId: memberships.eventId, role: memberships.role, people: count(), pending: sql<number>`count(*) filter (where ${users.passwordHash} is null)::int` })
      .from(memberships).innerJoin(users, eq(users.id, memberships.userId)).where(inArray(memberships.eventId, eventIds)).groupBy(memberships.eventId, memberships.role)
    : []
  const machineRows = eventIds.length
    ? await db.select({ eventId: teams.eventId, teamId: teams.id, team: teams.name, machine: machines.name })
      .from(machines).innerJoin(teams, eq(teams.id, machines.teamId)).where(inArray(teams.eventId, eventIds))
    : []
  const riderRows = eventIds.length
    ? await db.select({ teamId: riders.teamId, name: riders.name, licenceExpires: riders.licenceExpires, endsOn: events.endsOn })
      .from(riders).innerJoin(teams, eq(teams.id, riders.teamId)).innerJoin(events, eq(events.id, teams.eventId)).where(inArray(teams.eventId, eventIds))
    : []

  const homes: RoleHome[] = mine.map((m) => {
    const at = `/events/${m.eventId}`
    const tc = trapCounts.find(t => t.eventId === m.eventId)
    const roles = roleCounts.filter(r => r.eventId === m.eventId)
    const held = (role: EventRole) => roles.find(r => r.role === role)?.people ?? 0
    const tasks: Task[] = []
    if (m.role === 'organiser') {
      tasks.push({ title: 'Survey the course', detail: tc ? `${tc.courses} course(s), ${tc.traps} trap(s) at surveyed positions` : 'No course yet: set the course and its traps', href: at, done: !!tc && tc.traps >= 2 })
      for (const role of ['timekeeper', 'scrutineer', 'official'] as const) {
        tasks.push({ title: `Name ${role === 'official' ? 'an' : 'a'} ${role}`, detail: held(role) ? `${held(role)} named` : `No ${role} yet`, href: `${at}/people`, done: held(role) > 0 })
      }
      const pending = roles.reduce((s, r) => s + r.pending, 0)
      tasks.push({ title: 'Invitations accepted', detail: pending ? `${pending} invitation(s) not yet accepted` : 'Everyone invited has signed in', href: `${at}/people`, done: pending === 0 })
    } else if (m.role === 'timekeeper') {
      tasks.push({ title: 'Check the traps against the survey', detail: tc ? `${tc.traps} trap(s) on the course` : 'The organiser has not set the course yet', href: at, done: false })
    } else if (m.role === 'scrutineer') {
      const ms = machineRows.filter(x => x.eventId === m.eventId)
      tasks.push({ title: 'Inspect the machines', detail: ms.length ? ms.map(x => `${x.machine} (${x.team})`).join(', ') : 'No machine entered yet', href: at, done: false })
    } else if (m.role === 'team') {
      const ms = machineRows.filter(x => x.teamId === m.teamId)
      tasks.push({ title: 'Register the machine', detail: ms.length ? ms.map(x => x.machine).join(', ') : 'No machine registered yet', href: at, done: ms.length > 0 })
      const rs = riderRows.filter(r => r.teamId === m.teamId)
      for (const r of rs) {
        const valid = r.licenceExpires >= r.endsOn
        tasks.push({ title: `Rider licence: ${r.name}`, detail: valid ? `valid until ${r.licenceExpires}` : `expires ${r.licenceExpires}, before the event ends`, href: at, done: valid })
      }
      if (!rs.length) tasks.push({ title: 'Register the rider', detail: 'No rider yet', href: at, done: false })
    } else if (m.role === 'official') {
      const ms = machineRows.filter(x => x.eventId === m.eventId)
      tasks.push({ title: 'Entries to witness', detail: ms.length ? `${ms.length} machine(s) entered` : 'No entries yet', href: at, done: false })
    }
    tasks.sort((a, b) => Number(a.done) - Number(b.done))
    return { eventId: m.eventId, eventName: m.eventName, role: m.role, teamName: m.teamName, tasks }
  })

  let admin: { eventsWithoutOrganiser: { id: number; name: string }[] } | null = null
  if (user.isAdmin) {
    const orphan = await db.select({ id: events.id, name: events.name }).from(events)
      .leftJoin(memberships, and(eq(memberships.eventId, events.id), eq(memberships.role, 'organiser')))
      .where(isNull(memberships.id))
    admin = { eventsWithoutOrganiser: orphan }
  }
  return { user, homes, admin }
}
