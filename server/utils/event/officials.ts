import { and, asc, eq, isNull } from 'drizzle-orm'
import { OFFICIAL_FUNCTION_LABELS, type OfficialFunction } from '#shared/constants'
import type { PermitInput } from '#shared/schemas/officials'

export async function setPermit(eventId: number, input: PermitInput) {
  const values = { eventId, ...input, updatedAt: new Date() }
  const [row] = await useDb().insert(tables.eventPermits).values(values)
    .onConflictDoUpdate({ target: tables.eventPermits.eventId, set: values }).returning()
  return row!
}

/** Appoints a person who holds a role at the event to an official function. */
export async function appoint(eventId: number, fn: OfficialFunction, userId: number, by: number) {
  const [member] = await useDb().select({ id: tables.memberships.userId }).from(tables.memberships)
    .where(and(eq(tables.memberships.eventId, eventId), eq(tables.memberships.userId, userId)))
  if (!member) throw fieldInvalid('userId', 'holds no role at this event: invite the person first')
  if (fn === 'steward' || fn === 'observer') {
    await refuseTeamMemberAsJudge(useDb(), eventId, userId, OFFICIAL_FUNCTION_LABELS[fn].toLowerCase())
  }
  if (await holdsAppointment(eventId, userId, fn)) {
    throw conflict(`This person is already ${OFFICIAL_FUNCTION_LABELS[fn].toLowerCase()}`)
  }
  const [row] = await useDb().insert(tables.appointments).values({ eventId, function: fn, userId, appointedBy: by })
    .returning()
  return row!
}

/** Whether the person holds an appointment to the function at the event, in force: the one check of it. */
export async function holdsAppointment(eventId: number, userId: number, fn: OfficialFunction, db: Tx | Db = useDb()) {
  const [held] = await db.select({ id: tables.appointments.id }).from(tables.appointments)
    .where(and(eq(tables.appointments.eventId, eventId), eq(tables.appointments.userId, userId),
      eq(tables.appointments.function, fn), isNull(tables.appointments.endedAt)))
  return !!held
}

export async function endAppointment(id: number, reason: string) {
  const [row] = await useDb().update(tables.appointments).set({ endedAt: new Date(), endReason: reason })
    .where(and(eq(tables.appointments.id, id), isNull(tables.appointments.endedAt))).returning()
  if (!row) throw conflict('This appointment has ended already')
  return row
}

/** The permit and the appointments in force (and ended), with names, and the required functions nobody holds. */
export async function officialsOf(eventId: number, required: OfficialFunction[] = []) {
  const [permit] = await useDb().select().from(tables.eventPermits).where(eq(tables.eventPermits.eventId, eventId))
  const list = await useDb().select({ a: tables.appointments, name: tables.users.name, email: tables.users.email })
    .from(tables.appointments).innerJoin(tables.users, eq(tables.users.id, tables.appointments.userId))
    .where(eq(tables.appointments.eventId, eventId)).orderBy(asc(tables.appointments.id))
  const inForce = list.filter(x => !x.a.endedAt)
  return {
    permit: permit ?? null,
    appointments: list.map(x => ({ ...x.a, name: x.name, label: OFFICIAL_FUNCTION_LABELS[x.a.function] })),
    missing: required.filter(fn => !inForce.some(x => x.a.function === fn)),
  }
}
