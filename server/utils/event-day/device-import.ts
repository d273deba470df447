import { and, eq, inArray, sql } from 'drizzle-orm'
import { assignPassings, readDeviceFile, type Assigned, type DeviceLayout } from '#shared/rules/device-file'
import type { DeviceImportInput } from '#shared/schemas/device-import'

/** A device's event list is a few hundred lines a day: a file over this is not one. */
const MAX_DEVICE_FILE_BYTES = 5 * 1024 * 1024

/**
 * A timing device's own file, stored first as evidence of kind data log, read by the system's layout
 * and given to runs. Without `commit` the assignment is shown; with it the passings given to runs are
 * written in one transaction, each reading naming the file, and the layout is kept for the next file.
 */
export async function importDeviceFile(eventId: number, input: DeviceImportInput, userId: number) {
  const system = await eventSystem(eventId, input.systemId)
  const layout = input.layout ?? (await savedLayout(system.id))
  if (!layout) throw fieldInvalid('layout', 'set the columns and the channel map of this timing system first')
  const ctx = await loadDeviceContext(eventId, system.id)
  checkChannels(layout, ctx.traps)
  const file = await deviceEvidence(eventId, input.evidenceId)
  const parsed = readDeviceFile(await readBlobText(file.sha256), layout)
  const { assigned, unmatched } = assignPassings({
    passings: parsed.passings,
    channels: layout.channels,
    traps: ctx.traps,
    runs: ctx.runs,
    ticksPerSecond: system.ticksPerSecond,
    // A device set to UTC writes UTC times of day (and dates): placed in UTC, not the event's zone.
    timeZone: system.timeBase === 'utc' ? 'UTC' : ctx.timeZone,
    firstDay: input.firstDay,
  })
  const preview = {
    file: { id: file.id, name: file.originalName, sha256: file.sha256 },
    problems: parsed.problems,
    runs: byRun(assigned),
    unmatched,
  }
  if (!input.commit) return { ...preview, written: 0 }
  const [problem] = parsed.problems
  if (problem) throw fieldInvalid('evidenceId', `line ${problem.line}: ${problem.message}`)
  if (!assigned.length) throw fieldInvalid('evidenceId', 'no passing in this file can be given to a run')
  const written = await writeDeviceReadings(ctx, system.id, file.id, assigned, userId)
  await keepLayout(system.id, layout, userId)
  return { ...preview, written }
}

async function eventSystem(eventId: number, systemId: number) {
  const [system] = await useDb().select().from(tables.timingSystems)
    .where(and(eq(tables.timingSystems.id, systemId), eq(tables.timingSystems.eventId, eventId)))
  if (!system) throw fieldInvalid('systemId', 'no such timing system at this event')
  return system
}

/** The layout kept for a timing system, if any. */
export async function savedLayout(systemId: number): Promise<DeviceLayout | null> {
  const [row] = await useDb().select().from(tables.deviceLayouts)
    .where(eq(tables.deviceLayouts.timingSystemId, systemId))
  return row?.layout ?? null
}

/** The layouts kept for these timing systems. */
export async function deviceLayoutsOf(systemIds: number[]) {
  if (!systemIds.length) return []
  return useDb().select({ systemId: tables.deviceLayouts.timingSystemId, layout: tables.deviceLayouts.layout })
    .from(tables.deviceLayouts).where(inArray(tables.deviceLayouts.timingSystemId, systemIds))
}

/** Checks a layout against the event (its system, its traps) and keeps it. */
export async function saveDeviceLayout(eventId: number, systemId: number, layout: DeviceLayout, userId: number) {
  const system = await eventSystem(eventId, systemId)
  checkChannels(layout, await eventTraps(eventId))
  await keepLayout(system.id, layout, userId)
}

function checkChannels(layout: DeviceLayout, traps: { id: number }[]) {
  layout.channels.forEach((c, i) => {
    if (!traps.some(t => t.id === c.trapId))
      throw fieldInvalid(`layout.channels.${i}.trapId`, 'no such trap at this event')
  })
}

/** Keeps a timing system's layout for its next file (a setting: the latest replaces the one before). */
async function keepLayout(systemId: number, layout: DeviceLayout, userId: number) {
  await useDb().insert(tables.deviceLayouts)
    .values({ timingSystemId: systemId, layout, updatedBy: userId })
    .onConflictDoUpdate({
      target: tables.deviceLayouts.timingSystemId,
      set: { layout, updatedBy: userId, updatedAt: new Date() },
    })
}

async function deviceEvidence(eventId: number, evidenceId: number) {
  const [file] = await useDb().select().from(tables.evidence)
    .where(and(eq(tables.evidence.id, evidenceId), eq(tables.evidence.eventId, eventId)))
  if (!file) throw fieldInvalid('evidenceId', 'no such file at this event')
  if (file.kind !== 'data-log') throw fieldInvalid('evidenceId', 'is not a data log: store the device file as one')
  if (file.size > MAX_DEVICE_FILE_BYTES) {
    throw fieldInvalid('evidenceId', 'is over 5 MB: not a timing device\'s event list (split it by day)')
  }
  return file
}

async function readBlobText(sha256: string) {
  const chunks: Buffer[] = []
  for await (const chunk of await useBlobStore().open(sha256)) chunks.push(Buffer.from(chunk))
  return Buffer.concat(chunks).toString('utf8')
}

/** The event's traps with their course. */
async function eventTraps(eventId: number) {
  const { rows } = await useDb().execute<{ id: number, course_id: number, label: string }>(sql`
    select t.id, t.course_id, t.label from traps t join courses c on c.id = t.course_id
    where c.event_id = ${eventId} and t.retired_at is null`)
  return rows.map(t => ({ id: t.id, courseId: t.course_id, label: t.label }))
}

type RunRow = {
  id: number
  course_id: number
  status: string
  attempt_id: number
  started_at: Date
  signed: boolean
  taken: number[] | null
}

/** The event's runs with their course, whether they take readings, and which traps this system has timed. */
async function loadDeviceContext(eventId: number, systemId: number) {
  const db = useDb()
  const [event, runs, traps] = await Promise.all([
    db.select({ timeZone: tables.events.timeZone }).from(tables.events).where(eq(tables.events.id, eventId)),
    db.execute<RunRow>(sql`
      select r.id, d.course_id, r.status, r.attempt_id, r.started_at,
        coalesce((select kind = 'timing-sheet' from signatures s where s.subject_id = r.attempt_id
          and s.kind in ('timing-sheet', 'timing-sheet-reopened') order by s.id desc limit 1), false) as signed,
        (select array_agg(x.trap_id) from readings x where x.run_id = r.id and x.system_id = ${systemId}
          and x.supersedes_id is null) as taken
      from runs r join attempts a on a.id = r.attempt_id join entries e on e.id = a.entry_id
      join measured_distances d on d.id = e.distance_id where r.event_id = ${eventId}`),
    eventTraps(eventId),
  ])
  return {
    timeZone: event[0]!.timeZone,
    attemptOf: new Map(runs.rows.map(r => [r.id, r.attempt_id])),
    runs: runs.rows.map(r => ({
      id: r.id,
      courseId: r.course_id,
      startedAtMs: new Date(r.started_at).getTime(),
      closed: r.status === 'aborted' ? 'was aborted' : r.signed ? 'belongs to a signed timing sheet' : null,
      taken: r.taken ?? [],
    })),
    traps,
  }
}

const byRun = (assigned: Assigned[]) => [...new Set(assigned.map(a => a.runId))].map(runId => ({
  runId,
  passings: assigned.filter(a => a.runId === runId)
    .map(({ ticks: _, atMs, ...a }) => ({ ...a, at: new Date(atMs).toISOString() })),
}))

/** Every passing given to a run, or none: a sheet signed or a time entered meanwhile writes nothing. */
async function writeDeviceReadings(
  ctx: Awaited<ReturnType<typeof loadDeviceContext>>,
  systemId: number,
  evidenceId: number,
  assigned: Assigned[],
  userId: number,
) {
  const attempts = new Set(assigned.map(a => ctx.attemptOf.get(a.runId)!))
  return useDb().transaction(async (tx) => {
    for (const attemptId of attempts) await refuseIfSheetSigned(tx, attemptId, 'a reading from a device file')
    const inserted = await tx.insert(tables.readings)
      .values(assigned.map(a => ({
        runId: a.runId,
        trapId: a.trapId,
        systemId,
        ticks: a.ticks,
        sourceEvidenceId: evidenceId,
        enteredBy: userId,
      })))
      .onConflictDoNothing()
      .returning({ id: tables.readings.id })
    if (inserted.length !== assigned.length) {
      throw conflict('Some traps in this file were given times from the same system meanwhile; nothing was written. '
        + 'Look at the file again.')
    }
    return inserted.length
  })
}
