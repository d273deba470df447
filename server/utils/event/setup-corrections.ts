import { and, desc, eq, isNull, sql } from 'drizzle-orm'
import { checkMeasuredDistance } from '#shared/rules/course'
import type { SetupKind } from '#shared/schemas/setup-corrections'

/** The table and the subject name of each kind of set-up item the organiser corrects or retires. */
const kinds = {
  'traps': { table: tables.traps, subject: 'trap', noun: 'trap' },
  'distances': { table: tables.measuredDistances, subject: 'distance', noun: 'measured distance' },
  'timing-systems': { table: tables.timingSystems, subject: 'timing-system', noun: 'timing system' },
  'records': { table: tables.standingRecords, subject: 'record', noun: 'standing record' },
} as const

type SignedSheets = Awaited<ReturnType<typeof signedSheetsOf>>
type Row = Record<string, unknown> & { id: number, retiredAt: Date | null }

/** The item, of this event, not retired; else 404. */
async function itemOf(tx: Tx, eventId: number, kind: SetupKind, id: number): Promise<Row> {
  const { rows } = await tx.execute<{ id: number }>(kind === 'traps' || kind === 'distances'
    ? sql`select x.id from ${kinds[kind].table} x join courses c on c.id = x.course_id
          where x.id = ${id} and c.event_id = ${eventId} for update of x`
    : sql`select id from ${kinds[kind].table} where id = ${id} and event_id = ${eventId} for update`)
  if (!rows.length) throw notFound(`No such ${kinds[kind].noun} at this event`)
  const table = kinds[kind].table
  const [row] = await tx.select().from(table).where(eq(table.id, id))
  if ((row as Row).retiredAt) throw conflict(`This ${kinds[kind].noun} is retired; add a new one instead`)
  return row as Row
}

/** The attempts whose figures rest on the item: its readings, its claims, its class and distance. */
async function attemptsUsing(tx: Tx, kind: SetupKind, row: Row): Promise<number[]> {
  const q = {
    'traps': sql`select distinct r.attempt_id as id from readings g join runs r on r.id = g.run_id
      where g.trap_id = ${row.id}`,
    'timing-systems': sql`select distinct r.attempt_id as id from readings g join runs r on r.id = g.run_id
      where g.system_id = ${row.id}`,
    'distances': sql`select a.id from attempts a join entries e on e.id = a.entry_id
      where ${row.id} = any(e.distance_ids)`,
    'records': sql`select a.id from attempts a join entries e on e.id = a.entry_id
      join measured_distances d on d.id = any(e.distance_ids)
      where e.event_id = ${row.eventId as number} and e.class_name = ${row.className as string}
        and d.label = ${row.distanceLabel as string}`,
  }[kind]
  const { rows } = await tx.execute<{ id: number }>(q)
  return rows.map(r => Number(r.id))
}

/** Why the item cannot change: a signed timing sheet rests on it. Null when nothing signed does. */
async function lockedBy(tx: Tx, eventId: number, kind: SetupKind, row: Row, sheets?: SignedSheets) {
  const using = new Set(await attemptsUsing(tx, kind, row))
  const signed = (sheets ?? await signedSheetsOf(eventId)).filter(s => using.has(s.attemptId))
  if (!signed.length) return null
  const many = signed.length > 1
  return `Locked: the signed timing sheet${many ? 's' : ''} of attempt${many ? 's' : ''} `
    + `${signed.map(s => `#${s.attemptId}`).join(', ')} rest${many ? '' : 's'} on this ${kinds[kind].noun}. `
    + 'Reopen the sheet with a reason on the run sheet first.'
}

/** What a change keeps of a row for the history: its own fields, never ids of other records' internals. */
const snapshot = (row: Row) => Object.fromEntries(Object.entries(row)
  .filter(([k]) => !['retiredAt'].includes(k))
  .map(([k, v]) => [k, v instanceof Date ? v.toISOString() : v]))

async function record(tx: Tx, eventId: number, kind: SetupKind, row: Row, change: {
  action: 'edit' | 'retire'
  after: Row | null
  reason: string
  userId: number
}) {
  await tx.insert(tables.setupChanges).values({
    eventId,
    subject: kinds[kind].subject,
    subjectId: row.id,
    action: change.action,
    before: snapshot(row),
    after: change.after ? snapshot(change.after) : null,
    reason: change.reason,
    changedBy: change.userId,
  })
}

/** The new values checked as the route for adding them checks them: a distance against its survey. */
async function checkValues(tx: Tx, eventId: number, kind: SetupKind, values: Record<string, unknown>) {
  if (kind === 'traps' || kind === 'distances') await courseOf(eventId, values.courseId as number)
  if (kind !== 'distances') return
  const traps = await tx.select().from(tables.traps)
    .where(and(eq(tables.traps.courseId, values.courseId as number), isNull(tables.traps.retiredAt)))
  const entry = traps.find(t => t.id === values.entryTrapId)
  const exit = traps.find(t => t.id === values.exitTrapId)
  if (!entry) throw fieldInvalid('entryTrapId', 'is not a trap of this course')
  if (!exit) throw fieldInvalid('exitTrapId', 'is not a trap of this course')
  const [course] = await tx.select().from(tables.courses).where(eq(tables.courses.id, values.courseId as number))
  const [event] = await tx.select({ profile: tables.events.profile }).from(tables.events)
    .where(eq(tables.events.id, eventId))
  const check = checkMeasuredDistance(event!.profile, entry, exit, String(values.nominalM), course!.surveyToleranceMm)
  if (!check.withinTolerance) throw fieldInvalid('nominalM', check.findings[0]!.message)
}

/**
 * Corrects a set-up item in place, keeping the values before and the reason;
 * refused once a signed sheet rests on it.
 */
export async function correctSetupItem(
  eventId: number,
  kind: SetupKind,
  id: number,
  values: Record<string, unknown>,
  reason: string,
  userId: number,
) {
  return useDb().transaction(async (tx) => {
    const row = await itemOf(tx, eventId, kind, id)
    const locked = await lockedBy(tx, eventId, kind, row)
    if (locked) throw conflict(locked)
    await checkValues(tx, eventId, kind, values)
    const table = kinds[kind].table
    let after: Row
    try {
      after = (await tx.update(table).set(values).where(eq(table.id, id)).returning())[0] as Row
    }
    catch (e) {
      if ((e as { cause?: { code?: string } }).cause?.code === '23505' || (e as { code?: string }).code === '23505') {
        throw conflict(`Another ${kinds[kind].noun} of this event already has that name or role`)
      }
      throw e
    }
    await record(tx, eventId, kind, row, { action: 'edit', after, reason, userId })
    return after
  })
}

/** Retires an item no run, claim or signed sheet uses: it leaves the set-up, its history stays. */
export async function retireSetupItem(eventId: number, kind: SetupKind, id: number, reason: string, userId: number) {
  return useDb().transaction(async (tx) => {
    const row = await itemOf(tx, eventId, kind, id)
    const locked = await lockedBy(tx, eventId, kind, row)
    if (locked) throw conflict(locked)
    const using = kind === 'records' ? [] : await attemptsUsing(tx, kind, row)
    if (using.length) {
      throw conflict(`Attempt${using.length > 1 ? 's' : ''} ${using.map(a => `#${a}`).join(', ')} use this `
        + `${kinds[kind].noun}: correct it instead, or correct the readings first`)
    }
    if (kind === 'traps') {
      const [d] = await tx.select({ label: tables.measuredDistances.label }).from(tables.measuredDistances)
        .where(and(isNull(tables.measuredDistances.retiredAt),
          sql`${id} in (${tables.measuredDistances.entryTrapId}, ${tables.measuredDistances.exitTrapId})`))
      if (d) throw conflict(`The measured distance ${d.label} is timed by this trap: retire or correct it first`)
    }
    if (kind === 'distances') {
      const [e] = await tx.select({ id: tables.entries.id }).from(tables.entries)
        .where(sql`${id} = any(${tables.entries.distanceIds})`)
      if (e) throw conflict(`Entry #${e.id} claims this measured distance: it stays while an entry claims it`)
    }
    const table = kinds[kind].table
    const [after] = await tx.update(table).set({ retiredAt: new Date() }).where(eq(table.id, id)).returning()
    await record(tx, eventId, kind, row, { action: 'retire', after: after as Row, reason, userId })
    return { id, retired: true }
  })
}

/** Every correction and retirement at the event, newest first, with who made it. */
export async function setupHistoryOf(eventId: number) {
  return useDb()
    .select({
      id: tables.setupChanges.id,
      subject: tables.setupChanges.subject,
      subjectId: tables.setupChanges.subjectId,
      action: tables.setupChanges.action,
      before: tables.setupChanges.before,
      after: tables.setupChanges.after,
      reason: tables.setupChanges.reason,
      at: tables.setupChanges.changedAt,
      by: tables.users.name,
    })
    .from(tables.setupChanges)
    .innerJoin(tables.users, eq(tables.users.id, tables.setupChanges.changedBy))
    .where(eq(tables.setupChanges.eventId, eventId))
    .orderBy(desc(tables.setupChanges.id))
}

/** For each item of the set-up, why it is locked (null where it may be corrected). */
export async function setupLocks(eventId: number, items: { kind: SetupKind, row: Row }[]) {
  const db = useDb() as unknown as Tx
  const sheets = await signedSheetsOf(eventId)
  const out: Record<string, string | null> = {}
  for (const { kind, row } of items) {
    out[`${kind}:${row.id}`] = sheets.length ? await lockedBy(db, eventId, kind, row, sheets) : null
  }
  return out
}
