import { and, eq, isNull, sql } from 'drizzle-orm'
import Papa from 'papaparse'
import type { CsvImportInput } from '#shared/schemas/event-day'
import { parseTimeOfDay } from '#shared/rules/timing'

export interface ImportRowError {
  line: number
  column: string
  message: string
}

interface ImportRow { line: number, runId: number, trapId: number, systemId: number, ticks: bigint, time: string }
type Columns = CsvImportInput['columns']
type ImportContext = Awaited<ReturnType<typeof loadImportContext>>

/** A row refused: the error to report. */
class RowRefused extends Error {
  constructor(readonly column: string, message: string) {
    super(message)
  }
}

/** The most rows one import takes: a long day of two systems at four traps is a few thousand. */
export const MAX_IMPORT_ROWS = 10_000

/**
 * A timing system's CSV export: one row per trap passing (run, trap label, time of day, optional
 * system). Checked whole first; written only when every row is valid, in one transaction.
 */
export async function importReadings(eventId: number, input: CsvImportInput, userId: number) {
  const parsed = parseCsv(input.csv)
  if (parsed.data.length > MAX_IMPORT_ROWS) {
    throw fieldInvalid('csv', `has ${parsed.data.length} rows; one import takes at most ${MAX_IMPORT_ROWS} `
      + '(split the file by run or by hour)')
  }
  const missing = missingColumns(parsed.meta.fields ?? [], input.columns)
  if (missing.length) return { ok: false, rows: [], errors: missing, written: 0 }
  const ctx = await loadImportContext(eventId)
  const errors: ImportRowError[] = []
  if (!input.columns.system && !input.systemId) {
    errors.push({ line: 1, column: 'system', message: 'choose the timing system of this file or map a system column' })
  }
  const rows: ImportRow[] = []
  const seen = new Set<string>()
  parsed.data.forEach((raw, i) => {
    const line = i + 2
    try {
      const row = checkRow(ctx, input, raw, line, errors)
      const { trapRun, system } = row.what
      if (seen.has(row.key)) throw new RowRefused(input.columns.trap, `a second time for ${trapRun} from ${system}`)
      seen.add(row.key)
      if (ctx.taken.has(row.key)) {
        const message = `${trapRun} already has a time from ${system}; correct it on the run sheet`
        throw new RowRefused(input.columns.trap, message)
      }
      rows.push(row.reading)
    }
    catch (e) {
      if (!(e instanceof RowRefused)) throw e
      errors.push({ line, column: e.column, message: e.message })
    }
  })
  for (const e of parsed.errors) errors.push({ line: (e.row ?? 0) + 2, column: '', message: e.message })
  const preview = rows.map(({ ticks: _ticks, ...r }) => r)
  if (errors.length || !input.commit) {
    return { ok: errors.length === 0, rows: preview, errors: errors.sort((a, b) => a.line - b.line), written: 0 }
  }
  return { ok: true, rows: preview, errors: [], written: await writeImport(ctx, rows, userId) }
}

const parseCsv = (csv: string) => Papa.parse<Record<string, string>>(csv.trim(), {
  header: true,
  delimiter: ',',
  skipEmptyLines: true,
  transformHeader: h => h.trim(),
})

/** Every mapped column must be in the header. */
function missingColumns(headers: string[], columns: Columns): ImportRowError[] {
  const wanted = Object.values(columns).filter((v): v is string => !!v)
  const missing = wanted.filter(col => !headers.includes(col))
  const hint = headers.length === 1 && /[;\t|]/.test(headers[0]!)
    ? ` The header reads "${headers[0]}": is the delimiter a comma?`
    : ''
  return missing.map(col => ({ line: 1, column: col, message: `column "${col}" is missing from the header.${hint}` }))
}

/** The event's runs, traps, timing systems, signed sheets and readings already entered. */
async function loadImportContext(eventId: number) {
  const db = useDb()
  const [runs, traps, systems, locked, existing] = await Promise.all([
    db.execute<{ id: number, course_id: number, status: string, attempt_id: number }>(sql`
      select r.id, d.course_id, r.status, r.attempt_id from runs r join attempts a on a.id = r.attempt_id
      join entries e on e.id = a.entry_id join measured_distances d on d.id = e.distance_id
      where r.event_id = ${eventId}`),
    db.execute<{ id: number, course_id: number, label: string }>(sql`
      select t.id, t.course_id, t.label from traps t join courses c on c.id = t.course_id
      where c.event_id = ${eventId} and t.retired_at is null`),
    db.select().from(tables.timingSystems)
      .where(and(eq(tables.timingSystems.eventId, eventId), isNull(tables.timingSystems.retiredAt))),
    db.execute<{ subject_id: number, kind: string }>(sql`
      select distinct on (subject_id) subject_id, kind from signatures
      where event_id = ${eventId} and kind in ('timing-sheet', 'timing-sheet-reopened')
      order by subject_id, id desc`),
    db.execute<{ key: string }>(sql`
      select x.run_id || '/' || x.trap_id || '/' || x.system_id as key
      from readings x join runs r on r.id = x.run_id where r.event_id = ${eventId}`),
  ])
  return {
    runs: runs.rows,
    traps: traps.rows,
    systems,
    lockedAttempts: new Set(locked.rows.filter(r => r.kind === 'timing-sheet').map(r => r.subject_id)),
    taken: new Set(existing.rows.map(r => r.key)),
  }
}

const cell = (raw: Record<string, string>, column: string | undefined) => (column ? (raw[column] ?? '').trim() : '')

/** The run of a row; an aborted run or a signed sheet is reported and the row still checked on. */
function rowRun(ctx: ImportContext, columns: Columns, text: string, line: number, errors: ImportRowError[]) {
  const run = ctx.runs.find(r => String(r.id) === text)
  if (!run) throw new RowRefused(columns.run, `no run ${JSON.stringify(text)} at this event`)
  if (run.status === 'aborted') errors.push({ line, column: columns.run, message: `run ${run.id} was aborted` })
  if (ctx.lockedAttempts.has(run.attempt_id)) {
    errors.push({ line, column: columns.run, message: `run ${run.id} belongs to a signed timing sheet` })
  }
  return run
}

function rowSystem(ctx: ImportContext, input: CsvImportInput, text: string) {
  const system = input.columns.system
    ? ctx.systems.find(s => s.name === text || s.role === text)
    : ctx.systems.find(s => s.id === input.systemId)
  if (!system) {
    throw new RowRefused(input.columns.system ?? 'system', `no timing system ${JSON.stringify(text || input.systemId)}`)
  }
  return system
}

function rowTicks(column: string, time: string, ticksPerSecond: number) {
  try {
    return parseTimeOfDay(time, BigInt(ticksPerSecond))
  }
  catch (e) {
    throw new RowRefused(column, (e as Error).message)
  }
}

/** One row resolved to a run, a trap of its course, a timing system and a time; throws what is wrong. */
function checkRow(
  ctx: ImportContext,
  input: CsvImportInput,
  raw: Record<string, string>,
  line: number,
  errors: ImportRowError[],
) {
  const { columns } = input
  const run = rowRun(ctx, columns, cell(raw, columns.run), line, errors)
  const trapText = cell(raw, columns.trap)
  const trap = ctx.traps.find(t => t.label === trapText && t.course_id === run.course_id)
  if (!trap) throw new RowRefused(columns.trap, `no trap ${JSON.stringify(trapText)} on run ${run.id}'s course`)
  const system = rowSystem(ctx, input, cell(raw, columns.system))
  const time = cell(raw, columns.time)
  const ticks = rowTicks(columns.time, time, system.ticksPerSecond)
  return {
    key: `${run.id}/${trap.id}/${system.id}`,
    what: { trapRun: `${trap.label} on run ${run.id}`, system: system.name },
    reading: { line, runId: run.id, trapId: trap.id, systemId: system.id, ticks, time },
  }
}

/** All rows in one transaction, or none: a sheet signed or a time entered meanwhile writes nothing. */
async function writeImport(ctx: ImportContext, rows: ImportRow[], userId: number) {
  const attemptIds = new Set(ctx.runs.filter(r => rows.some(x => x.runId === r.id)).map(r => r.attempt_id))
  return useDb().transaction(async (tx) => {
    for (const attemptId of attemptIds) {
      const { signed } = await lockAttempt(tx, attemptId)
      if (signed) throw conflict('A timing sheet in this file was signed meanwhile; nothing was written')
    }
    const inserted = await tx
      .insert(tables.readings)
      .values(rows.map(({ runId, trapId, systemId, ticks }) => ({ runId, trapId, systemId, ticks, enteredBy: userId })))
      .onConflictDoNothing()
      .returning({ id: tables.readings.id })
    if (inserted.length !== rows.length) {
      throw conflict('Some traps in this file already have times from the same system; nothing was written. '
        + 'Correct those readings one by one.')
    }
    return inserted.length
  })
}
