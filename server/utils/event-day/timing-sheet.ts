import type { AuthenticationResponseJSON } from '@simplewebauthn/types'
import { sql } from 'drizzle-orm'
import { formatTimeOfDay } from '#shared/rules/timing'
import type { EventDay } from './load'
import { computeLive } from './live'

/** The canonical content of an attempt's timing sheet: every reading with its history, and the result. */
export function timingSheetContent(day: EventDay, attemptId: number) {
  const attempt = day.attempts.find(a => a.id === attemptId)
  if (!attempt) throw notFound('No such attempt')
  const live = computeLive({ ...day, attempts: [attempt] }, { readings: true })[0]!
  const trapLabel = new Map(day.traps.map(t => [t.id, t.label]))
  const system = new Map(day.systems.map(s => [s.id, s]))
  const runs = day.runs.filter(r => r.attemptId === attemptId)
  const { distanceId: _, distanceStart: __, ...entry } = live.entry
  // Fields added later appear only where they say something, so a sheet signed before them still hashes
  // as it was signed: the start of a standing-start run, the results of an entry claiming several distances.
  const more = live.distances.length > 1
    ? { results: live.distances.map(d => ({ distance: d.label, result: d.result, window: d.window })) }
    : {}
  return {
    attempt: attemptId,
    event: { id: day.event.id, name: day.event.name, timeZone: day.event.timeZone },
    entry,
    profile: attempt.profile,
    timingSystems: day.systems.map(s => ({
      id: s.id,
      name: s.name,
      role: s.role,
      ticksPerSecond: s.ticksPerSecond,
      calibratedOn: s.calibratedOn,
      calibrationExpires: s.calibrationExpires,
    })),
    runs: runs.map(r => ({
      id: r.id,
      direction: r.direction,
      ...(r.start === 'flying' ? {} : { start: r.start }),
      startedAt: r.startedAt.toISOString(),
      status: r.status,
      abortedReason: r.abortedReason,
      readings: day.readings
        .filter(x => x.runId === r.id)
        .map(x => ({
          id: x.id,
          trap: trapLabel.get(x.trapId),
          system: system.get(x.systemId)!.name,
          time: formatTimeOfDay(x.ticks, BigInt(system.get(x.systemId)!.ticksPerSecond)),
          ticks: x.ticks.toString(),
          supersedes: x.supersedesId,
          reason: x.reason,
          enteredBy: x.enteredBy,
          enteredAt: x.enteredAt.toISOString(),
        })),
      official: live.runs.find(lr => lr.id === r.id)?.official ?? null,
    })),
    result: live.result,
    window: live.window,
    findings: live.findings.map(f => f.code),
    ...more,
  }
}

/** Locks the attempt row so that signing and entering readings never interleave. */
export async function lockAttempt(tx: Tx, attemptId: number) {
  await tx.execute(sql`select id from attempts where id = ${attemptId} for update`)
  const { rows } = await tx.execute<{ id: number, kind: string }>(sql`
    select id, kind from signatures
    where subject_id = ${attemptId} and kind in ('timing-sheet', 'timing-sheet-reopened')
    order by id desc limit 1`)
  const signed = rows[0]?.kind === 'timing-sheet'
  return { signed, signatureId: signed ? Number(rows[0]!.id) : null }
}

/** 409 when the attempt's timing sheet is signed: what it covers changes only after a signed reopening. */
export async function refuseIfSheetSigned(tx: Tx, attemptId: number, what: string) {
  const { signed, signatureId } = await lockAttempt(tx, attemptId)
  if (!signed) return
  throw conflict(
    `The timing sheet of attempt #${attemptId} is signed (signature #${signatureId}); `
    + `reopen it with a reason on the run sheet before ${what}`,
    { signatureId, attemptId },
  )
}

/** The signed timing sheets of an event: attempts whose latest sheet act is a signature. */
export async function signedSheetsOf(eventId: number) {
  const { rows } = await useDb().execute<{ subject_id: number, id: number, kind: string }>(sql`
    select distinct on (subject_id) subject_id, id, kind from signatures
    where event_id = ${eventId} and kind in ('timing-sheet', 'timing-sheet-reopened')
    order by subject_id, id desc`)
  return rows
    .filter(r => r.kind === 'timing-sheet')
    .map(r => ({ attemptId: Number(r.subject_id), signatureId: Number(r.id) }))
}

/** Signs (or reopens) the timing sheet of an attempt: who, when, typed name, SHA-256 of the content. */
export async function signTimingSheet(input: {
  eventId: number
  attemptId: number
  userId: number
  password?: string
  passkey?: AuthenticationResponseJSON
  typedName: string
  nameNote?: string
  reopen?: string
  drawingPng?: string
  /** Only for the demo's seed, which signs on its own calendar. */
  signedAt?: Date
}) {
  await refuseConflicted(useDb(), { eventId: input.eventId, userId: input.userId },
    [await teamOfAttemptIn(useDb(), input.attemptId)], 'sign or reopen the timing sheet of this team\'s attempt')
  const proof = await signerProof(input.userId, input)
  return useDb().transaction(async (tx) => {
    const { signed } = await lockAttempt(tx, input.attemptId)
    if (input.reopen ? !signed : signed) {
      throw createError({
        statusCode: 409,
        statusMessage: input.reopen
          ? 'The timing sheet is not signed, so there is nothing to reopen'
          : 'The timing sheet is already signed; reopen it with a reason to correct it',
      })
    }
    const day = await loadEventDay(input.eventId, { history: true })
    const content = timingSheetContent(day, input.attemptId)
    const previous = day.signatures
      .filter(x => x.s.subjectId === input.attemptId && x.s.kind.startsWith('timing-sheet'))
      .at(-1)
    const row = await insertSignature(tx, {
      proof,
      kind: input.reopen ? 'timing-sheet-reopened' : 'timing-sheet',
      subjectId: input.attemptId,
      eventId: input.eventId,
      signerId: input.userId,
      typedName: input.typedName,
      nameNote: input.nameNote,
      content,
      reason: input.reopen,
      supersedesId: previous?.s.id,
      drawingPng: input.drawingPng,
      signedAt: input.signedAt,
    })
    return { id: row.id, kind: row.kind, sha256: row.contentSha256, signedAt: row.signedAt }
  })
}
