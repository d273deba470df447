import { and, eq, inArray } from 'drizzle-orm'
import { checkMeasuredDistance } from '#shared/rules/course'
import { copyProfile, profiles } from '#shared/rules/profiles'
import { classesOf, findClass, propulsionRefusal, type RecordClass } from '#shared/rules/classes'
import type { PowerSource } from '#shared/constants'
import { claimProblems } from '#shared/rules/distances'
import type { RuleProfile } from '#shared/rules/profile'
import type {
  ClassesAdaptInput,
  DistanceInput,
  EntryInput,
  ProfileAdaptInput,
} from '#shared/schemas/event-day'

const unprocessable = fieldInvalid

/** A course of this event, else 422 on the field (the caller already holds a role at the event). */
export async function courseOf(eventId: number, courseId: number, field = 'courseId') {
  const [course] = await useDb()
    .select()
    .from(tables.courses)
    .where(and(eq(tables.courses.id, courseId), eq(tables.courses.eventId, eventId)))
  if (!course) throw unprocessable(field, 'is not a course of this event')
  return course
}

/** Adds a measured distance after checking it against the surveyed trap positions and the profile. */
export async function addMeasuredDistance(eventId: number, input: DistanceInput) {
  const course = await courseOf(eventId, input.courseId)
  const traps = await useDb()
    .select()
    .from(tables.traps)
    .where(
      and(eq(tables.traps.courseId, course.id), inArray(tables.traps.id, [input.entryTrapId, input.exitTrapId])),
    )
  const entry = traps.find(t => t.id === input.entryTrapId)
  const exit = traps.find(t => t.id === input.exitTrapId)
  if (!entry) throw unprocessable('entryTrapId', 'is not a trap of this course')
  if (!exit) throw unprocessable('exitTrapId', 'is not a trap of this course')
  const [event] = await useDb()
    .select({ profile: tables.events.profile })
    .from(tables.events)
    .where(eq(tables.events.id, eventId))
  const check = checkMeasuredDistance(event!.profile, entry, exit, input.nominalM, course.surveyToleranceMm)
  if (!check.withinTolerance) throw unprocessable('nominalM', check.findings[0]!.message)
  const [row] = await useDb().insert(tables.measuredDistances).values(input).onConflictDoNothing().returning()
  if (!row)
    throw createError({
      statusCode: 409,
      statusMessage: `This course already has a distance called ${input.label}`,
    })
  return { ...row, check }
}

/** Copies a library profile, adapts the given values with the organiser's stated source, bumps the version. */
export async function adaptProfile(eventId: number, input: ProfileAdaptInput) {
  const [event] = await useDb()
    .select({ profile: tables.events.profile })
    .from(tables.events)
    .where(eq(tables.events.id, eventId))
  const base = profiles[input.baseId]
  const p: RuleProfile = copyProfile(base)
  const adapted = { source: `adapted by the organiser: ${input.source}`, certainty: 'seen' as const }
  if (input.windowMinutes !== undefined) {
    const from = p.window.value.kind === 'elapsed' ? p.window.value.from : 'start-first'
    const to = p.window.value.kind === 'elapsed' ? p.window.value.to : 'finish-second'
    p.window = { value: { kind: 'elapsed', minutes: input.windowMinutes, from, to }, ...adapted }
  }
  if (input.marginPercent !== undefined)
    p.margin = { value: { percent: input.marginPercent, inclusive: input.marginPercent > 0 }, ...adapted }
  if (input.tailWindLimitMs !== undefined) p.tailWindLimitMs = { value: input.tailWindLimitMs, ...adapted }
  if (input.witnessStatements !== undefined) p.witnessStatements = { value: input.witnessStatements, ...adapted }
  if (input.averaging !== undefined) p.averaging = { value: input.averaging, ...adapted }
  if (input.postRunCheck !== undefined) p.postRunCheck = { value: input.postRunCheck, ...adapted }
  if (p.protests && (input.protestMinutes || input.protestBy || input.appealMinutes)) {
    const rule = structuredClone(p.protests.value)
    if (input.protestMinutes) rule.lodge = { kind: 'minutes', minutes: input.protestMinutes }
    if (input.protestBy) rule.lodge = { kind: 'clock', at: input.protestBy, daysAfter: 0 }
    if (input.appealMinutes && rule.appeal) rule.appeal.deadline = { kind: 'minutes', minutes: input.appealMinutes }
    p.protests = { value: rule, ...adapted }
  }
  if (input.removeClasses.length || input.addClasses.length) p.classes = { value: adaptClasses(p, input), ...adapted }
  p.id = `${base.id}-adapted`
  p.name = `${base.name} (adapted)`
  p.version = Math.max(event!.profile.version, base.version) + 1
  const [row] = await useDb()
    .update(tables.events)
    .set({ profile: p, profileId: input.baseId })
    .where(eq(tables.events.id, eventId))
    .returning()
  return row!.profile
}

/**
 * Changes the class list of the event's profile as it stands (its other values kept): a new version of
 * the event's profile, with the stated source beside the list. Attempts keep the copy they opened with.
 */
export async function adaptEventClasses(eventId: number, input: ClassesAdaptInput) {
  return useDb().transaction(async (tx) => {
    const [event] = await tx.select({ profile: tables.events.profile }).from(tables.events)
      .where(eq(tables.events.id, eventId)).for('update')
    const p: RuleProfile = structuredClone(event!.profile)
    p.classes = {
      value: adaptClasses(p, input),
      source: `adapted by the organiser: ${input.source}`,
      certainty: 'seen',
    }
    p.version += 1
    const [row] = await tx.update(tables.events).set({ profile: p }).where(eq(tables.events.id, eventId)).returning()
    return row!.profile.classes!
  })
}

/** The profile's classes less those left out, plus those added; each named once. */
function adaptClasses(p: RuleProfile, input: Pick<ClassesAdaptInput, 'removeClasses' | 'addClasses'>): RecordClass[] {
  const base = classesOf(p)
  const missing = input.removeClasses.filter(l => !findClass(base, l))
  if (missing.length) throw unprocessable('removeClasses', `not a class of the profile: ${missing.join('; ')}`)
  const kept = base.filter(c => !input.removeClasses.some(l => findClass([c], l)))
  const added: RecordClass[] = []
  for (const c of input.addClasses) {
    if (findClass([...kept, ...added], c.label)) throw unprocessable('addClasses', `"${c.label}" is already a class`)
    added.push({ ...c, certainty: 'seen' })
  }
  return [...kept, ...added]
}

/**
 * The class as the event's profile spells it, for a label as a person typed it (case and spacing aside):
 * an entry and a standing record name one of the listed classes, so that they compare. A profile frozen
 * before classes were data lists none, and takes the label as typed.
 */
export async function eventClassLabel(eventId: number, label: string, db: Tx | Db = useDb(), power?: PowerSource) {
  const [event] = await db.select({ profile: tables.events.profile }).from(tables.events)
    .where(eq(tables.events.id, eventId))
  const classes = classesOf(event!.profile)
  if (!classes.length) return label
  const found = findClass(classes, label)
  if (!found) {
    const some = classes.slice(0, 3).map(c => `"${c.label}"`).join(', ')
    throw unprocessable('className', `choose one of the event's ${classes.length} classes (such as ${some})`)
  }
  const refusal = power ? propulsionRefusal(found, power, classes) : null
  if (refusal) throw unprocessable('className', refusal)
  return found.label
}

/**
 * The distances an entry claims, checked against the course and the event's profile: distances of this
 * event, each one the profile lists, all on one course, a standing start beginning at the start line.
 */
async function claimedDistances(eventId: number, ids: number[]) {
  const db = useDb()
  const rows = await db
    .select({ d: tables.measuredDistances, entryTrapPositionM: tables.traps.positionM })
    .from(tables.measuredDistances)
    .innerJoin(tables.courses, eq(tables.courses.id, tables.measuredDistances.courseId))
    .innerJoin(tables.traps, eq(tables.traps.id, tables.measuredDistances.entryTrapId))
    .where(and(inArray(tables.measuredDistances.id, ids), eq(tables.courses.eventId, eventId)))
  const unknown = ids.filter(id => !rows.some(r => r.d.id === id))
  if (unknown.length) {
    const named = unknown.map(i => `#${i}`).join(', ')
    throw unprocessable('distanceIds', `${named} is not a measured distance of this event`)
  }
  const [event] = await db.select({ profile: tables.events.profile }).from(tables.events)
    .where(eq(tables.events.id, eventId))
  const claims = ids.map(id => rows.find(r => r.d.id === id)!)
    .map(({ d, entryTrapPositionM }) => ({ ...d, entryTrapPositionM }))
  const problems = claimProblems(event!.profile, claims)
  if (problems.length) throw unprocessable('distanceIds', problems.map(p => p.message).join('; '))
  return ids
}

/** A team enters a machine and rider (new or already entered by the same team) for a class and distances. */
export async function addEntry(eventId: number, teamId: number, input: EntryInput) {
  const db = useDb()
  const distanceIds = await claimedDistances(eventId, input.distanceIds ?? [input.distanceId!])
  return db.transaction(async (tx) => {
    let machineId = input.machineId
    let power = input.machine?.power
    if (machineId) {
      const [m] = await tx
        .select()
        .from(tables.machines)
        .where(and(eq(tables.machines.id, machineId), eq(tables.machines.teamId, teamId)))
      if (!m) throw unprocessable('machineId', 'is not a machine of your team')
      power = m.power
    }
    else {
      machineId = (
        await tx
          .insert(tables.machines)
          .values({ ...input.machine!, teamId })
          .returning()
      )[0]!.id
    }
    let riderId = input.riderId
    if (riderId) {
      const [r] = await tx
        .select()
        .from(tables.riders)
        .where(and(eq(tables.riders.id, riderId), eq(tables.riders.teamId, teamId)))
      if (!r) throw unprocessable('riderId', 'is not a rider of your team')
    }
    else {
      riderId = (
        await tx
          .insert(tables.riders)
          .values({ ...input.rider!, teamId })
          .returning()
      )[0]!.id
    }
    const className = await eventClassLabel(eventId, input.className, tx, power)
    const [entry] = await tx
      .insert(tables.entries)
      .values({ eventId, teamId, machineId, riderId, className, distanceId: distanceIds[0]!, distanceIds })
      .returning()
    return entry!
  })
}
