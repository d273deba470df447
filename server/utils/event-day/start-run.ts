import { and, eq, inArray, ne } from 'drizzle-orm'
import { defaultRunStart } from '#shared/rules/distances'
import { placeRun, type OpenAttempt, type Placement } from '#shared/rules/run-placement'
import type { Direction } from '#shared/constants'
import type { StartRunInput } from '#shared/schemas/event-day'

const unprocessable = fieldInvalid

/**
 * The entry, locked for the start of a run; only an entry cleared by a signed inspection, paid where the
 * organiser requires it, and passed by the start line (licence, grade, medical, briefing) may run.
 */
async function lockClearedEntry(tx: Tx, eventId: number, entryId: number) {
  const [entry] = await tx
    .select()
    .from(tables.entries)
    .where(and(eq(tables.entries.id, entryId), eq(tables.entries.eventId, eventId)))
    .for('update')
  if (!entry) throw unprocessable('entryId', 'is not an entry of this event')
  const clearance = (await clearanceOf([entry.id])).get(entry.id)!
  if (!clearance.cleared) throw conflict(`This entry is not cleared to run: ${clearance.why}`, clearance)
  await refuseUnpaid(tx, entry)
  return entry
}

/**
 * Under a profile with a qualifying run (club procedure), whether the attempt is over and the entry
 * must qualify again: its record run was aborted, or its qualifying run did not beat the record.
 */
function mustQualifyAgain(day: EventDay, attempt: EventDay['attempts'][number], live: ReturnType<typeof computeLive>) {
  const rule = attempt.profile.qualifying?.value
  if (!rule) return false
  const mine = day.runs.filter(r => r.attemptId === attempt.id)
  const qualifier = mine.find(r => r.status !== 'aborted')
  if (!qualifier) return false
  const abortedAfter = mine.some(r => r.status === 'aborted' && r.startedAt > qualifier.startedAt)
  if (rule.requalifyAfterAbort && abortedAfter) return true
  if (!rule.mustBeatRecord) return false
  return !!live.find(a => a.id === attempt.id)?.findings.some(f => f.code === 'qualifier.not-over-record')
}

/**
 * The entry's open attempt: the latest with fewer than two runs that were not aborted and no signed
 * timing sheet, unless the profile's procedure makes the entry qualify again; with its runs and window.
 */
export function openAttemptOf(day: EventDay, entryId: number, live = computeLive(day)) {
  const signed = new Set(day.signatures.filter(x => x.s.kind === 'timing-sheet').map(x => x.s.subjectId))
  const counting = (id: number) => day.runs.filter(r => r.attemptId === id && r.status !== 'aborted')
  const attempt = day.attempts.filter(a => a.entryId === entryId)
    .findLast(a => counting(a.id).length < 2 && !signed.has(a.id))
  if (!attempt || mustQualifyAgain(day, attempt, live)) return null
  const window = live.find(a => a.id === attempt.id)?.window
  const open: OpenAttempt = {
    id: attempt.id,
    runs: counting(attempt.id).map(r => ({ id: r.id, direction: r.direction, startedAtMs: +r.startedAt })),
    windowDeadlineMs: window?.deadline ? Date.parse(window.deadline) : null,
    windowOpensMs: window?.opens ? Date.parse(window.opens) : null,
  }
  return { open, profile: attempt.profile }
}

/**
 * Where each entry's next run would go, out or back, if it left the line at `atMs`: what the run sheet
 * tells the timekeeper before the run starts.
 */
export function placementsOf(day: EventDay, atMs: number, live = computeLive(day)) {
  return new Map(day.entries.map(({ entry }) => {
    const found = openAttemptOf(day, entry.id, live)
    const profile = found?.profile ?? day.event.profile
    const at = (direction: Direction) =>
      placeRun(profile, found?.open ?? null, { direction, startedAtMs: atMs }, day.event.timeZone)
    return [entry.id, { out: at('out'), back: at('back') } as Record<Direction, Placement>]
  }))
}

/** A new attempt with a frozen copy of the event's profile. */
async function newAttempt(tx: Tx, eventId: number, entryId: number) {
  const [event] = await tx
    .select({ profile: tables.events.profile })
    .from(tables.events)
    .where(eq(tables.events.id, eventId))
  const [attempt] = await tx.insert(tables.attempts).values({ eventId, entryId, profile: event!.profile }).returning()
  return attempt!
}

/**
 * Starts a run for an entry. It joins the entry's open attempt where the pair it makes can count (the
 * profile's direction, inside its window), or opens a new attempt with a frozen copy of the event's
 * profile; the answer says which, and why.
 */
export async function startRun(eventId: number, input: StartRunInput, userId: number) {
  return useDb().transaction(async (tx) => {
    const entry = await lockClearedEntry(tx, eventId, input.entryId)
    const startedAt = input.startedAt ? new Date(input.startedAt) : new Date()
    const line = await refuseAtStartLine(tx, entry, startedAt,
      { expectedKmh: input.expectedKmh, upgrade: input.licenceUpgrade })
    if (input.licenceUpgrade && !line.upgradeTo) {
      throw unprocessable('licenceUpgrade', 'the profile grades no licences, or the rider holds the top grade')
    }
    const claims = await claimStarts(tx, entry.distanceIds)
    const start = input.start ?? defaultRunStart(claims)
    if (!claims.some(c => c.start === start)) {
      throw unprocessable('start', `the entry claims no ${start === 'standing' ? 'standing-start' : 'flying'} distance`)
    }
    // The day as committed: the entry's row lock above keeps a second start of it waiting until this one ends.
    const day = await loadEventDay(eventId)
    const found = openAttemptOf(day, entry.id)
    const placement = found
      ? placeRun(found.profile, found.open, { direction: input.direction, startedAtMs: +startedAt }, day.event.timeZone)
      : null
    const attemptId = placement?.joins ?? (await newAttempt(tx, eventId, entry.id)).id
    await refuseMixedStarts(tx, attemptId, start)
    const [run] = await tx
      .insert(tables.runs)
      .values({
        eventId, attemptId, direction: input.direction, start, startedAt, createdBy: userId,
        expectedKmh: line.expectedKmh === null ? null : String(line.expectedKmh),
        licenceUpgrade: input.licenceUpgrade ? line.upgradeTo : null,
        overrideId: line.findings.length ? line.override?.id ?? null : null,
      })
      .returning()
    return { ...run!, placement: placement?.message ?? 'This run starts a new attempt.' }
  })
}

const claimStarts = (tx: Tx, ids: number[]) =>
  tx.select({ start: tables.measuredDistances.start }).from(tables.measuredDistances)
    .where(inArray(tables.measuredDistances.id, ids))

/** The runs of one attempt are all flying passes or all standing starts: a pair is made of one kind. */
async function refuseMixedStarts(tx: Tx, attemptId: number, start: 'flying' | 'standing') {
  const [other] = await tx.select({ id: tables.runs.id, start: tables.runs.start }).from(tables.runs)
    .where(and(eq(tables.runs.attemptId, attemptId), ne(tables.runs.start, start), ne(tables.runs.status, 'aborted')))
  if (other) {
    const kind = other.start === 'standing' ? 'standing start' : 'flying pass'
    throw unprocessable('start', `run #${other.id} of this attempt is a ${kind}; finish or abort the attempt's `
      + 'pair before a run of the other kind')
  }
}
