import { and, desc, eq, inArray, isNotNull, lte } from 'drizzle-orm'
import { localDate, localDateTime } from '#shared/rules/zoned'
import { gradeIndex, reachedFindings, startLineFindings, upgradeTarget } from '#shared/rules/start-line'
import type { StartLineFinding } from '#shared/rules/start-line'
import { allItems } from '#shared/inspection/evaluate'
import type { RuleProfile } from '#shared/rules/profile'
import type { OverrideInput } from '#shared/schemas/officials'

type Rider = typeof tables.riders.$inferSelect
export interface StartIntent {
  expectedKmh?: number | null
  upgrade?: boolean
}
export interface StartLine {
  findings: StartLineFinding[]
  /** The findings no override of the day covers: what stops the start. */
  blocking: StartLineFinding[]
  override: { id: number, codes: string[], reason: string } | null
  expectedKmh: number | null
  /** The grade an upgrade run would be made for, where the profile grades licences. */
  upgradeTo: string | null
}

/** The latest briefing held at or before an instant, and the riders who signed on to it. */
async function latestBriefing(db: Tx | Db, eventId: number, at: Date) {
  const [b] = await db.select().from(tables.briefings)
    .where(and(eq(tables.briefings.eventId, eventId), lte(tables.briefings.heldAt, at)))
    .orderBy(desc(tables.briefings.heldAt), desc(tables.briefings.id)).limit(1)
  if (!b) return null
  const on = await db.select({ riderId: tables.briefingSignOns.riderId }).from(tables.briefingSignOns)
    .where(and(eq(tables.briefingSignOns.briefingId, b.id), isNotNull(tables.briefingSignOns.riderId)))
  return { briefing: b, riders: new Set(on.map(x => x.riderId!)) }
}

/** The speed each entry's latest signed inspection declared, km/h. */
async function declaredSpeeds(db: Tx | Db, entryIds: number[]) {
  const rows = entryIds.length
    ? await db.select({ entryId: tables.inspections.entryId, kmh: tables.inspections.declaredKmh })
        .from(tables.inspections)
        .where(and(inArray(tables.inspections.entryId, entryIds), isNotNull(tables.inspections.signatureId),
          isNotNull(tables.inspections.declaredKmh)))
        .orderBy(desc(tables.inspections.id))
    : []
  const out = new Map<number, number>()
  for (const r of rows) if (!out.has(r.entryId)) out.set(r.entryId, Number(r.kmh))
  return out
}

/** The fastest each entry went before an instant: its best official speed, the run, and whether an upgrade run. */
export type Reached = Map<number, { kmh: string, runId: number, upgrade: boolean }>

/**
 * From the live results of the day: each entry's fastest official speed (time over a measured distance, as the
 * timing sheet gives it) on runs that left before `atMs`; none before its first timed run. A segment between two
 * traps is not used: a short one carries the clock's resolution, and the official speed is what the sheet signs.
 * A run whose readings are in question (out of order, a speed or an acceleration no machine makes: a swapped channel,
 * a mistyped time) gives no speed reached until the timekeeper corrects them.
 */
export function reachedBefore(day: EventDay, attempts: ReturnType<typeof computeLive>, atMs: number): Reached {
  const out: Reached = new Map()
  for (const a of attempts) {
    for (const r of a.runs) {
      if (Date.parse(r.startedAt) >= atMs || !r.official) continue
      if (r.findings.some(f => f.code.startsWith('reading.'))) continue
      const kmh = r.official.kmh
      const seen = out.get(a.entry.id)
      const upgrade = !!day.runs.find(x => x.id === r.id)?.licenceUpgrade
      if (!seen || Number(kmh) > Number(seen.kmh)) out.set(a.entry.id, { kmh, runId: r.id, upgrade })
    }
  }
  return out
}

interface InspectedSafety {
  tyreRatedKmh: number | null
  parachutesFitted: number | null
  steps: { overMph: number, count: number }[] | null
}

/** What the inspection in force recorded of each entry's tyres and parachutes, and the parachute steps it used. */
async function inspectedSafety(db: Tx | Db, entryIds: number[]) {
  const rows = entryIds.length
    ? await db.select({ id: tables.inspections.id, entryId: tables.inspections.entryId,
        checklist: tables.inspections.checklist })
        .from(tables.inspections)
        .where(and(inArray(tables.inspections.entryId, entryIds), isNotNull(tables.inspections.signatureId)))
        .orderBy(desc(tables.inspections.id))
    : []
  const latest = new Map<number, (typeof rows)[number]>()
  for (const r of rows) if (!latest.has(r.entryId)) latest.set(r.entryId, r)
  const ids = [...latest.values()].map(r => r.id)
  const answers = ids.length
    ? await db.select().from(tables.inspectionAnswers).where(and(inArray(tables.inspectionAnswers.inspectionId, ids),
        inArray(tables.inspectionAnswers.itemKey, ['tyres-rated', 'parachute'])))
    : []
  const out = new Map<number, InspectedSafety>()
  for (const [entryId, insp] of latest) {
    const value = (key: string) =>
      answers.find(a => a.inspectionId === insp.id && a.itemKey === key && a.value !== null)?.value ?? null
    const item = allItems(insp.checklist).find(i => i.key === 'parachute')
    const steps = item?.limit?.kind === 'count-for-speed' ? item.limit.steps : null
    const tyres = value('tyres-rated')
    const chutes = value('parachute')
    out.set(entryId, {
      tyreRatedKmh: tyres === null ? null : Number(tyres),
      parachutesFitted: chutes === null ? null : Number(chutes),
      steps,
    })
  }
  return out
}

/**
 * What the start line says of each entry leaving at `at`: the rider's licence (expiry, grade for the
 * expected speed, medical) and the riders' briefing under the event's profile, and the clerk of the
 * course's override of the day where there is one.
 */
export async function startLineOf(
  db: Tx | Db,
  event: { id: number, timeZone: string, profile: RuleProfile },
  entries: { entry: { id: number }, rider: Rider }[],
  at: Date,
  intents = new Map<number, StartIntent>(),
  /** The fastest each entry went before `at` (see reachedBefore); none known, nothing judged on it. */
  reached: Reached = new Map(),
) {
  const day = localDate(+at, event.timeZone)
  const ids = entries.map(e => e.entry.id)
  const [briefing, declared, overrides, safety] = await Promise.all([
    latestBriefing(db, event.id, at),
    declaredSpeeds(db, ids),
    ids.length
      ? db.select().from(tables.startOverrides)
          .where(and(inArray(tables.startOverrides.entryId, ids), eq(tables.startOverrides.day, day)))
          .orderBy(desc(tables.startOverrides.id))
      : [],
    inspectedSafety(db, ids),
  ])
  const licence = event.profile.licence?.value ?? null
  const out = new Map<number, StartLine>()
  for (const { entry, rider } of entries) {
    const intent = intents.get(entry.id) ?? {}
    const expectedKmh = intent.expectedKmh ?? declared.get(entry.id) ?? null
    const findings = startLineFindings({
      licence,
      briefingRequired: !!event.profile.briefing?.value,
      rider,
      day,
      expectedKmh,
      upgrade: !!intent.upgrade,
      briefing: briefing && {
        title: briefing.briefing.title,
        heldAtLocal: localDateTime(+briefing.briefing.heldAt, event.timeZone).slice(0, 16),
        signedOn: briefing.riders.has(rider.id),
      },
    })
    const inspected = safety.get(entry.id)
    const grades = licence?.grades
    const held = grades ? gradeIndex(grades, rider.licenceGrade) : -1
    findings.push(...reachedFindings({
      reached: reached.get(entry.id) ?? null,
      grade: grades && held >= 0 ? grades[held]! : null,
      tyreRatedKmh: inspected?.tyreRatedKmh ?? null,
      parachutes: inspected?.parachutesFitted != null && inspected.steps
        ? { fitted: inspected.parachutesFitted, steps: inspected.steps }
        : null,
    }))
    const override = overrides.find(o => o.entryId === entry.id) ?? null
    out.set(entry.id, {
      findings,
      blocking: findings.filter(f => !override?.codes.includes(f.code)),
      override: override && { id: override.id, codes: override.codes, reason: override.reason },
      expectedKmh,
      upgradeTo: upgradeTarget(licence?.grades, rider.licenceGrade)?.label ?? null,
    })
  }
  return out
}

/** Refuses a start the start line blocks: each finding with its reason, and who can let it through. */
export async function refuseAtStartLine(
  tx: Tx,
  entry: { id: number, eventId: number, riderId: number },
  at: Date,
  intent: StartIntent,
) {
  const [event] = await tx.select().from(tables.events).where(eq(tables.events.id, entry.eventId))
  const [rider] = await tx.select().from(tables.riders).where(eq(tables.riders.id, entry.riderId))
  // The speed the machine reached on its runs so far, from the live results of the day.
  const eventDay = await loadEventDay(entry.eventId)
  const reached = reachedBefore(eventDay, computeLive(eventDay), +at)
  const line = (await startLineOf(tx, event!, [{ entry, rider: rider! }], at, new Map([[entry.id, intent]]), reached))
    .get(entry.id)!
  if (line.blocking.length) {
    throw conflict(`The start line stops this run: ${line.blocking.map(f => f.message).join('; ')}. `
      + 'Only the clerk of the course can let it start, with a signed reason.', { findings: line.blocking })
  }
  return line
}

/** Whether the person is the clerk of the course appointed at the event, who alone overrides the start line. */
export const isClerkOfCourse = (eventId: number, userId: number, db: Tx | Db = useDb()) =>
  holdsAppointment(eventId, userId, 'clerk-of-course', db)

/**
 * The clerk of the course lets an entry start over the start line's findings named, for the rest of the
 * event's day, with a signed reason. Only a person appointed clerk of the course (in force) can.
 */
export async function overrideStartLine(entryId: number, input: OverrideInput, user: { id: number }) {
  const [entry] = await useDb().select({ eventId: tables.entries.eventId, teamId: tables.entries.teamId })
    .from(tables.entries).where(eq(tables.entries.id, entryId))
  if (entry) {
    await refuseConflicted(useDb(), { eventId: entry.eventId, userId: user.id }, [entry.teamId],
      'let this team\'s entry start')
  }
  const proof = await signerProof(user.id, input)
  return useDb().transaction(async (tx) => {
    const [row] = await tx.select({ entry: tables.entries, event: tables.events }).from(tables.entries)
      .innerJoin(tables.events, eq(tables.events.id, tables.entries.eventId))
      .where(eq(tables.entries.id, entryId))
    if (!row) throw notFound('No such entry')
    if (!(await isClerkOfCourse(row.event.id, user.id, tx))) {
      throw forbidden('Only the clerk of the course appointed at this event can let a run start over these')
    }
    const day = localDate(Date.now(), row.event.timeZone)
    const [o] = await tx.insert(tables.startOverrides).values({
      eventId: row.event.id, entryId, day, codes: input.codes, reason: input.reason, createdBy: user.id,
    }).returning()
    const content = { eventId: row.event.id, override: o!.id, entryId, day, codes: o!.codes, reason: o!.reason }
    const signature = await insertSignature(tx, {
      proof, kind: 'start-override', subjectId: o!.id, eventId: row.event.id, signerId: user.id,
      typedName: input.typedName, nameNote: input.nameNote, content,
    })
    const [signed] = await tx.update(tables.startOverrides).set({ signatureId: signature.id })
      .where(eq(tables.startOverrides.id, o!.id)).returning()
    return signed!
  })
}
