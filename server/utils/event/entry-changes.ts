import { and, asc, desc, eq, inArray, or } from 'drizzle-orm'
import type { ChangeDecisionInput, EntryDetailsInput } from '#shared/schemas/event-day'

/** The entry with its rider and machine, locked; 404 when it is not of this event. */
async function lockEntry(tx: Tx, entryId: number) {
  const [entry] = await tx.select().from(tables.entries).where(eq(tables.entries.id, entryId)).for('update')
  if (!entry) throw notFound('No such entry')
  const [rider] = await tx.select().from(tables.riders).where(eq(tables.riders.id, entry.riderId))
  const [machine] = await tx.select().from(tables.machines).where(eq(tables.machines.id, entry.machineId))
  return { entry, rider: rider!, machine: machine! }
}

/**
 * Every entry that shares the entry's rider or machine (the rows are shared: a change of one is a change of all),
 * itself included, locked in id order.
 */
async function sharingEntries(tx: Tx, current: { rider: { id: number }, machine: { id: number } }) {
  const rows = await tx.select({ id: tables.entries.id }).from(tables.entries)
    .where(or(eq(tables.entries.riderId, current.rider.id), eq(tables.entries.machineId, current.machine.id)))
    .orderBy(asc(tables.entries.id)).for('update')
  return rows.map(r => r.id)
}

/** Whether any run of these entries has left the line (an aborted one too: the entry has started). */
async function hasRun(tx: Tx, entryIds: number[]) {
  const [run] = await tx.select({ id: tables.runs.id }).from(tables.runs)
    .innerJoin(tables.attempts, eq(tables.attempts.id, tables.runs.attemptId))
    .where(inArray(tables.attempts.entryId, entryIds)).limit(1)
  return !!run
}

const detailsOf = (x: Awaited<ReturnType<typeof lockEntry>>) => ({
  rider: {
    name: x.rider.name, licenceNo: x.rider.licenceNo, licenceExpires: x.rider.licenceExpires,
    licenceGrade: x.rider.licenceGrade, medicalExpires: x.rider.medicalExpires,
  },
  machine: {
    name: x.machine.name,
    power: x.machine.power,
    declaredMassKg: x.machine.declaredMassKg,
    division: x.machine.division,
  },
})

/** Writes the rider and machine as given and keeps the values before, who and why, in the history. */
async function apply(tx: Tx, current: Awaited<ReturnType<typeof lockEntry>>, changes: EntryDetailsInput, by: number,
  reason: string) {
  await tx.update(tables.riders).set(changes.rider).where(eq(tables.riders.id, current.rider.id))
  await tx.update(tables.machines).set(changes.machine).where(eq(tables.machines.id, current.machine.id))
  // The history of every entry the shared rider or machine belongs to: each shows what changed under it.
  const affected = await sharingEntries(tx, current)
  await tx.insert(tables.setupChanges).values(affected.map(entryId => ({
    eventId: current.entry.eventId,
    subject: 'entry' as const,
    subjectId: entryId,
    action: 'edit' as const,
    before: detailsOf(current),
    after: { rider: changes.rider, machine: changes.machine },
    reason: entryId === current.entry.id
      ? reason
      : `${reason} (made through entry #${current.entry.id}, which shares it)`,
    changedBy: by,
  })))
}

/**
 * A team corrects its entry: at once until its first run; after it, the change waits for the organiser
 * (a request, with the reason), since results and inspection already rest on what was entered. The rider and
 * machine are rows shared by every entry that names them: once any of those has run, the change waits too.
 */
export async function changeEntry(entryId: number, teamIds: number[], input: EntryDetailsInput, userId: number) {
  return useDb().transaction(async (tx) => {
    const current = await lockEntry(tx, entryId)
    if (!teamIds.includes(current.entry.teamId)) throw notFound('No such entry')
    if (!(await hasRun(tx, await sharingEntries(tx, current)))) {
      await apply(tx, current, input, userId, input.reason || 'corrected by the team before its first run')
      return { status: 'applied' as const }
    }
    if (input.reason.length < 3) {
      throw fieldInvalid('reason', 'say why: the entry has run, so the organiser approves the change')
    }
    const [request] = await tx.insert(tables.entryChangeRequests).values({
      entryId,
      changes: { rider: input.rider, machine: input.machine },
      reason: input.reason,
      requestedBy: userId,
    }).returning()
    return { status: 'requested' as const, requestId: request!.id }
  })
}

/** The organiser approves (the change is written, with the history) or refuses a pending request, with a note. */
export async function decideEntryChange(requestId: number, input: ChangeDecisionInput, userId: number) {
  return useDb().transaction(async (tx) => {
    const [request] = await tx.select().from(tables.entryChangeRequests)
      .where(eq(tables.entryChangeRequests.id, requestId)).for('update')
    if (!request) throw notFound('No such change request')
    if (request.status !== 'pending') throw conflict(`This request was already ${request.status}`)
    if (input.approve) {
      const current = await lockEntry(tx, request.entryId)
      const reason = `${request.reason} (approved${input.note ? `: ${input.note}` : ''})`
      await apply(tx, current, request.changes as EntryDetailsInput, userId, reason)
    }
    const [decided] = await tx.update(tables.entryChangeRequests).set({
      status: input.approve ? 'approved' : 'refused',
      decidedBy: userId,
      decidedAt: new Date(),
      decisionNote: input.note,
    }).where(eq(tables.entryChangeRequests.id, requestId)).returning()
    return decided!
  })
}

/** The change requests of some entries, newest first; and the history of their corrections. */
export async function entryChangesOf(eventId: number, entryIds: number[]) {
  if (!entryIds.length) return { requests: [], history: [] }
  const requests = await useDb().select({
    id: tables.entryChangeRequests.id,
    entryId: tables.entryChangeRequests.entryId,
    changes: tables.entryChangeRequests.changes,
    reason: tables.entryChangeRequests.reason,
    status: tables.entryChangeRequests.status,
    requestedAt: tables.entryChangeRequests.requestedAt,
    decisionNote: tables.entryChangeRequests.decisionNote,
  }).from(tables.entryChangeRequests)
    .where(inArray(tables.entryChangeRequests.entryId, entryIds))
    .orderBy(desc(tables.entryChangeRequests.id))
  const history = (await setupHistoryOf(eventId))
    .filter(h => h.subject === 'entry' && entryIds.includes(h.subjectId))
  return { requests, history }
}

/** Whether each entry has run: a team edits at once before, through a request after. */
export async function entriesThatRan(entryIds: number[]) {
  if (!entryIds.length) return new Set<number>()
  const rows = await useDb().selectDistinct({ id: tables.attempts.entryId }).from(tables.runs)
    .innerJoin(tables.attempts, eq(tables.attempts.id, tables.runs.attemptId))
    .where(and(inArray(tables.attempts.entryId, entryIds)))
  return new Set(rows.map(r => r.id))
}
