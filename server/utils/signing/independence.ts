import { and, eq, inArray, isNotNull } from 'drizzle-orm'

/**
 * The one check of independence, for every act an official signs about a team's attempt, entry, machine or claim:
 * nobody who holds a role in a team at the event (a team member, its rider among them) witnesses, inspects, times,
 * sets aside, decides a protest or appeal, confirms, ratifies or homologates anything of that team. Refused with
 * 409 naming the team and the act, before anything is asked or written.
 */
export async function refuseConflicted(
  db: Tx | Db,
  who: { eventId: number, userId: number },
  teamIds: number[],
  act: string,
) {
  const teams = teamIds.length ? await conflictingTeams(db, who, teamIds) : []
  if (teams.length) {
    throw conflict(`Not independent: you hold a role in ${teams.map(t => `the team “${t}”`).join(' and ')}, so you `
      + `cannot ${act}; an official of no team of the attempt does`, { conflict: teams })
  }
}

/** The names of the teams, among these, in which this person holds a role at the event. */
async function conflictingTeams(db: Tx | Db, who: { eventId: number, userId: number }, teamIds: number[]) {
  const rows = await db.selectDistinct({ name: tables.teams.name }).from(tables.memberships)
    .innerJoin(tables.teams, eq(tables.teams.id, tables.memberships.teamId))
    .where(and(eq(tables.memberships.eventId, who.eventId), eq(tables.memberships.userId, who.userId),
      inArray(tables.memberships.teamId, teamIds)))
  return rows.map(r => r.name)
}

/**
 * A steward or observer is appointed only from people of no team competing at the event: every team of the event
 * competes there, so any team role refuses the appointment.
 */
export async function refuseTeamMemberAsJudge(db: Tx | Db, eventId: number, userId: number, fn: string) {
  const rows = await db.selectDistinct({ teamId: tables.memberships.teamId }).from(tables.memberships)
    .where(and(eq(tables.memberships.eventId, eventId), eq(tables.memberships.userId, userId),
      isNotNull(tables.memberships.teamId)))
  await refuseConflicted(db, { eventId, userId }, rows.map(r => r.teamId!), `be appointed ${fn} at this event`)
}

/** The team of an attempt, or null when there is no such attempt. */
export async function findTeamOfAttempt(db: Tx | Db, attemptId: number) {
  const [row] = await db.select({ teamId: tables.entries.teamId }).from(tables.attempts)
    .innerJoin(tables.entries, eq(tables.entries.id, tables.attempts.entryId))
    .where(eq(tables.attempts.id, attemptId))
  return row?.teamId ?? null
}

/** The team of an attempt; 404 when there is no such attempt. */
export async function teamOfAttemptIn(db: Tx | Db, attemptId: number) {
  const teamId = await findTeamOfAttempt(db, attemptId)
  if (teamId === null) throw notFound('No such attempt')
  return teamId
}

/**
 * Only a steward appointed at the event, and of no team of the attempt, signs a decision of the stewards (a
 * set-aside, the confirmation of a result); asked before the password. `act` completes "signs …" and "cannot …".
 */
export async function refuseUnlessIndependentSteward(eventId: number, userId: number, attemptId: number,
  act: { signs: string, conflicted: string }) {
  if (!(await holdsAppointment(eventId, userId, 'steward'))) {
    throw forbidden(`Only a steward appointed at this event signs ${act.signs}: it is a decision of the stewards`)
  }
  await refuseConflicted(useDb(), { eventId, userId }, [await teamOfAttemptIn(useDb(), attemptId)], act.conflicted)
}
