import { and, eq, isNull } from 'drizzle-orm'
import type { User } from '#auth-utils'
import type { RoleHome } from '#shared/types/home'
import { loadHomeFacts } from './home-facts'
import { tasksFor } from './home-tasks'

/** Events nobody organises: the administrator's to-do. */
function eventsWithoutOrganiser() {
  const { events, memberships } = tables
  return useDb()
    .select({ id: events.id, name: events.name })
    .from(events)
    .leftJoin(memberships, and(eq(memberships.eventId, events.id), eq(memberships.role, 'organiser')))
    .where(isNull(memberships.id))
}

/** What each of this person's roles has to do next, open tasks first. */
export async function homeFor(user: User) {
  const mine = await membershipsOf(user.id)
  const facts = await loadHomeFacts([...new Set(mine.map(m => m.eventId))])
  const homes: RoleHome[] = mine.map(m => ({
    eventId: m.eventId,
    eventName: m.eventName,
    role: m.role,
    teamName: m.teamName,
    tasks: tasksFor(facts, m),
  }))
  const admin = user.isAdmin ? { eventsWithoutOrganiser: await eventsWithoutOrganiser() } : null
  return { user, homes, admin }
}
