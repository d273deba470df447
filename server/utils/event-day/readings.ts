import { eq, sql } from 'drizzle-orm'
import Papa from 'papaparse'
import { parseTimeOfDay } from '#shared/rules/timing'

type Tx = Parameters<Parameters<ReturnType<typeof useDb>['transaction']>[0]>[0]

const conflict = (statusMessage: string, data?: unknown) => createError({ statusCode: 409, statusMessage, data })

/** The run with its event's trap and timing-system ids, to refuse a reading for another course. */
async function runContext(tx: Tx, runId: number) {
  const { rows } = await tx.execute<{
    attempt_id: number
    status: string
    event_id: number
    course_id: number
  }>(sql`
    select r.attempt_id, r.status, r.event_id, d.course_id
    from runs r join attempts a on a.id = r.attempt_id join entries e on e.id = a.entry_id
    join measured_distances d on d.id = e.distance_id where r.id = ${runId}`)
  if (!rows[0]) throw createError({ statusCode: 404, statusMessage: 'No such run' })
  return rows[0]
}

function ticksOf(time: string, ticksPerSecond: number, field: string) {
  try {
    return parseTimeOfDay(time, BigInt(ticksPerSecond))
  }
  catch (e) {
    throw fieldInvalid(field, (e as Error).message)
  }
}

async function checkTrapAndSystem(
  tx: Tx,
  ctx: { event_id: number, course_id: number },
  trapId: number,
  systemId: number,
) {
  const { rows } = await tx.execute<{ trap: number | null, tps: number | null }>(sql`
    select (select id from traps where id = ${trapId} and course_id = ${ctx.course_id}) as trap,
           (select ticks_per_second from timing_systems where id = ${systemId} and event_id = ${ctx.event_id}) as tps`)
  const issues = []
  if (!rows[0]?.trap) issues.push({ path: 'trapId', message: 'is not a trap of this run\'s course' })
  if (!rows[0]?.tps) issues.push({ path: 'systemId', message: 'is not a timing system of this event' })
  if (issues.length) throw fieldsInvalid(issues)
  return rows[0]!.tps!
}

async function assertWritable(tx: Tx, ctx: { attempt_id: number, status: string }) {
  const { signed } = await lockAttempt(tx, ctx.attempt_id)
  if (signed)
    throw conflict('The timing sheet of this attempt is signed; reopen it with a reason before changing readings')
  if (ctx.status === 'aborted') throw conflict('This run was aborted; its readings are kept as they are')
}

/** A first reading of a trap by a timing system. A second one for the same trap is a correction. */
export async function enterReading(
  runId: number,
  input: { trapId: number, systemId: number, time: string },
  userId: number,
) {
  return useDb().transaction(async (tx) => {
    const ctx = await runContext(tx, runId)
    const tps = await checkTrapAndSystem(tx, ctx, input.trapId, input.systemId)
    await assertWritable(tx, ctx)
    const ticks = ticksOf(input.time, tps, 'time')
    const inserted = await tx
      .insert(tables.readings)
      .values({ runId, trapId: input.trapId, systemId: input.systemId, ticks, enteredBy: userId })
      .onConflictDoNothing()
      .returning({ id: tables.readings.id })
    if (!inserted.length) {
      const current = await currentReading(tx, runId, input.trapId, input.systemId)
      throw conflict('This trap already has a time from this system; correct it with a reason instead', { current })
    }
    return { id: inserted[0]!.id }
  })
}

async function currentReading(tx: Tx, runId: number, trapId: number, systemId: number) {
  const { rows } = await tx.execute<{ id: number, ticks: string }>(sql`
    select id, ticks::text from readings x where run_id = ${runId} and trap_id = ${trapId} and system_id = ${systemId}
    and not exists (select 1 from readings s where s.supersedes_id = x.id)`)
  return rows[0] ?? null
}

/** A correction is a new reading that supersedes the current one; the one it names must still be current. */
export async function correctReading(
  readingId: number,
  input: { time: string, reason: string, expectedCurrentId: number },
  userId: number,
) {
  return useDb().transaction(async (tx) => {
    const [old] = await tx.select().from(tables.readings).where(eq(tables.readings.id, readingId))
    if (!old) throw createError({ statusCode: 404, statusMessage: 'No such reading' })
    const ctx = await runContext(tx, old.runId)
    const tps = await checkTrapAndSystem(tx, ctx, old.trapId, old.systemId)
    await assertWritable(tx, ctx)
    const current = await currentReading(tx, old.runId, old.trapId, old.systemId)
    if (!current || Number(current.id) !== input.expectedCurrentId || Number(current.id) !== readingId) {
      throw conflict('Someone corrected this time first; here is the current value', { current })
    }
    const ticks = ticksOf(input.time, tps, 'time')
    const inserted = await tx
      .insert(tables.readings)
      .values({
        runId: old.runId,
        trapId: old.trapId,
        systemId: old.systemId,
        ticks,
        supersedesId: readingId,
        reason: input.reason,
        enteredBy: userId,
      })
      .onConflictDoNothing()
      .returning({ id: tables.readings.id })
    if (!inserted.length)
      throw conflict('Someone corrected this time first; here is the current value', {
        current: await currentReading(tx, old.runId, old.trapId, old.systemId),
      })
    return { id: inserted[0]!.id }
  })
}

export interface ImportRowError {
  line: number
  column: string
  message: string
}

/**
 * A timing system's CSV export: one row per trap passing (run, trap label, time of day, optional
 * system). Checked whole first; written only when every row is valid, in one transaction.
 */
export async function importReadings(
  eventId: number,
  input: {
    csv: string
    columns: { run: string, trap: string, time: string, system?: string }
    systemId?: number
    commit: boolean
  },
  userId: number,
) {
  const parsed = Papa.parse<Record<string, string>>(input.csv.trim(), {
    header: true,
    delimiter: ',',
    skipEmptyLines: true,
    transformHeader: h => h.trim(),
  })
  const errors: ImportRowError[] = []
  const headers = parsed.meta.fields ?? []
  const wanted = Object.entries(input.columns).filter(([, v]) => v) as [string, string][]
  const missing = wanted.filter(([, col]) => !headers.includes(col))
  if (missing.length) {
    const hint
      = headers.length === 1 && /[;\t|]/.test(headers[0]!)
        ? ` The header reads "${headers[0]}": is the delimiter a comma?`
        : ''
    for (const [, col] of missing)
      errors.push({ line: 1, column: col, message: `column "${col}" is missing from the header.${hint}` })
    return { ok: false, rows: [], errors, written: 0 }
  }
  if (!input.columns.system && !input.systemId)
    errors.push({
      line: 1,
      column: 'system',
      message: 'choose the timing system of this file or map a system column',
    })

  const db = useDb()
  const [runs, traps, systems, locked, existing] = await Promise.all([
    db.execute<{ id: number, course_id: number, status: string, attempt_id: number }>(sql`
      select r.id, d.course_id, r.status, r.attempt_id from runs r join attempts a on a.id = r.attempt_id
      join entries e on e.id = a.entry_id join measured_distances d on d.id = e.distance_id where r.event_id = ${eventId}`),
    db.execute<{ id: number, course_id: number, label: string }>(
      sql`select t.id, t.course_id, t.label from traps t join courses c on c.id = t.course_id where c.event_id = ${eventId}`,
    ),
    db.select().from(tables.timingSystems).where(eq(tables.timingSystems.eventId, eventId)),
    db.execute<{ subject_id: number, kind: string }>(
      sql`select distinct on (subject_id) subject_id, kind from signatures where event_id = ${eventId} and kind in ('timing-sheet', 'timing-sheet-reopened') order by subject_id, id desc`,
    ),
    db.execute<{ key: string }>(
      sql`select x.run_id || '/' || x.trap_id || '/' || x.system_id as key from readings x join runs r on r.id = x.run_id where r.event_id = ${eventId}`,
    ),
  ])
  const taken = new Set(existing.rows.map(r => r.key))
  const lockedAttempts = new Set(locked.rows.filter(r => r.kind === 'timing-sheet').map(r => r.subject_id))
  const seen = new Set<string>()
  const rows: { line: number, runId: number, trapId: number, systemId: number, ticks: bigint, time: string }[] = []
  parsed.data.forEach((raw, i) => {
    const line = i + 2
    const runText = (raw[input.columns.run] ?? '').trim()
    const run = runs.rows.find(r => String(r.id) === runText)
    if (!run) {
      errors.push({ line, column: input.columns.run, message: `no run ${JSON.stringify(runText)} at this event` })
      return
    }
    if (run.status === 'aborted')
      errors.push({ line, column: input.columns.run, message: `run ${run.id} was aborted` })
    if (lockedAttempts.has(run.attempt_id))
      errors.push({ line, column: input.columns.run, message: `run ${run.id} belongs to a signed timing sheet` })
    const trapText = (raw[input.columns.trap] ?? '').trim()
    const trap = traps.rows.find(t => t.label === trapText && t.course_id === run.course_id)
    if (!trap) {
      errors.push({
        line,
        column: input.columns.trap,
        message: `no trap ${JSON.stringify(trapText)} on run ${run.id}'s course`,
      })
      return
    }
    const sysText = input.columns.system ? (raw[input.columns.system] ?? '').trim() : ''
    const system = input.columns.system
      ? systems.find(s => s.name === sysText || s.role === sysText)
      : systems.find(s => s.id === input.systemId)
    if (!system) {
      errors.push({
        line,
        column: input.columns.system ?? 'system',
        message: `no timing system ${JSON.stringify(sysText || input.systemId)}`,
      })
      return
    }
    const time = (raw[input.columns.time] ?? '').trim()
    let ticks: bigint
    try {
      ticks = parseTimeOfDay(time, BigInt(system.ticksPerSecond))
    }
    catch (e) {
      errors.push({ line, column: input.columns.time, message: (e as Error).message })
      return
    }
    const key = `${run.id}/${trap.id}/${system.id}`
    if (seen.has(key)) {
      errors.push({
        line,
        column: input.columns.trap,
        message: `a second time for ${trap.label} on run ${run.id} from ${system.name}`,
      })
      return
    }
    seen.add(key)
    if (taken.has(key)) {
      errors.push({
        line,
        column: input.columns.trap,
        message: `${trap.label} on run ${run.id} already has a time from ${system.name}; correct it on the run sheet`,
      })
      return
    }
    rows.push({ line, runId: run.id, trapId: trap.id, systemId: system.id, ticks, time })
  })
  for (const e of parsed.errors) errors.push({ line: (e.row ?? 0) + 2, column: '', message: e.message })

  const preview = rows.map(r => ({
    line: r.line,
    runId: r.runId,
    trapId: r.trapId,
    systemId: r.systemId,
    time: r.time,
  }))
  if (errors.length || !input.commit)
    return { ok: errors.length === 0, rows: preview, errors: errors.sort((a, b) => a.line - b.line), written: 0 }

  const written = await db.transaction(async (tx) => {
    for (const attemptId of new Set(
      runs.rows.filter(r => rows.some(x => x.runId === r.id)).map(r => r.attempt_id),
    )) {
      const { signed } = await lockAttempt(tx, attemptId)
      if (signed) throw conflict('A timing sheet in this file was signed meanwhile; nothing was written')
    }
    const inserted = await tx
      .insert(tables.readings)
      .values(
        rows.map(r => ({
          runId: r.runId,
          trapId: r.trapId,
          systemId: r.systemId,
          ticks: r.ticks,
          enteredBy: userId,
        })),
      )
      .onConflictDoNothing()
      .returning({ id: tables.readings.id })
    if (inserted.length !== rows.length) {
      throw conflict(
        'Some traps in this file already have times from the same system; nothing was written. Correct those readings one by one.',
      )
    }
    return inserted.length
  })
  return { ok: true, rows: preview, errors: [], written }
}
