import { sql, type SQL } from 'drizzle-orm'
import { fileTypeFromBuffer } from 'file-type'
import { evidenceKinds, extensionMismatch, formatBytes, TEXT, type EvidenceKind } from '#shared/evidence/kinds'
import { evidenceFieldsSchema, type EvidenceFieldsInput } from '#shared/schemas/evidence'
import type { EventAccess } from '../auth/auth'
import type { StagedFile } from './uploads'

type Fields = EvidenceFieldsInput
const noSuchEvidence = () => notFound('No such evidence')
const field = fieldInvalid

/** The team(s) a target belongs to, or null for event-level targets; 422 if it is not of this event. */
async function targetTeams(eventId: number, f: Fields): Promise<number[] | null> {
  const db = useDb()
  const one = async (path: string, q: SQL) => {
    const { rows } = await db.execute<{ team_id: number | null }>(q)
    if (!rows.length) throw field(path, 'is not part of this event')
    return rows[0]!.team_id
  }
  const teams: number[] = []
  if (f.courseId)
    await one(
      'courseId',
      sql`select null::int as team_id from courses where id = ${f.courseId} and event_id = ${eventId}`,
    )
  if (f.timingSystemId)
    await one(
      'timingSystemId',
      sql`select null::int as team_id from timing_systems where id = ${f.timingSystemId} and event_id = ${eventId}`,
    )
  if (f.entryId)
    teams.push(
      (await one('entryId', sql`select team_id from entries where id = ${f.entryId} and event_id = ${eventId}`))!,
    )
  if (f.attemptId)
    teams.push(
      (await one(
        'attemptId',
        sql`select e.team_id from attempts a join entries e on e.id = a.entry_id where a.id = ${f.attemptId} and
          a.event_id = ${eventId}`,
      ))!,
    )
  if (f.runId)
    teams.push(
      (await one(
        'runId',
        sql`select e.team_id from runs r join attempts a on a.id = r.attempt_id join entries e on e.id = a.entry_id
          where r.id = ${f.runId} and r.event_id = ${eventId}`,
      ))!,
    )
  if (f.inspectionId)
    teams.push(
      (await one(
        'inspectionId',
        sql`select e.team_id from inspections i join entries e on e.id = i.entry_id where i.id = ${f.inspectionId}
          and i.event_id = ${eventId}`,
      ))!,
    )
  return teams.length ? teams : null
}

const teamOnly = actsAsTeamOnly

/** Checks the form fields before any byte of the file is stored; returns the kind's size limit. */
export function evidenceGate(access: EventAccess, checked: GateRecord = {}) {
  return async (raw: Record<string, unknown>) => {
    const r = evidenceFieldsSchema.safeParse(raw)
    if (!r.success) {
      const fieldsMissing = !('kind' in raw)
      if (fieldsMissing) throw field('kind', 'send the kind (and what the file belongs to) before the file')
      throw invalidInput(r.error)
    }
    assertCertificateRole(access, r.data)
    const teams = await targetTeams(access.eventId, r.data)
    // A person who holds a team role attaches to their own team's records only, unless also the organiser.
    const asTeam = teamOnly(access) || (access.roles.includes('team') && !access.roles.includes('organiser'))
    if (asTeam && teams && !teams.every(t => access.teamIds.includes(t))) throw noSuchEvidence()
    if (teamOnly(access) && !teams)
      throw field('entryId', 'a team attaches evidence to its own entry, attempt or run')
    checked.fields = r.data
    checked.raw = { ...raw }
    const room = await quotaLeft(access, teams)
    const kindLimit = limitFor(r.data.kind)
    return room < kindLimit
      ? { bytes: room, what: 'the room left in the team\'s storage at this event' }
      : { bytes: kindLimit, what: 'the limit for this kind' }
  }
}

/** What the gate checked before the file: the fields as sent, and as parsed. */
export interface GateRecord {
  fields?: Fields
  raw?: Record<string, unknown>
}

/**
 * The fields the gate checked, refusing any sent after the file (they were never checked): the staged
 * file is removed with the refusal.
 */
export async function checkedFields(file: StagedFile, after: Record<string, unknown>, checked: GateRecord) {
  const late = Object.keys(after).find(k => JSON.stringify(after[k]) !== JSON.stringify(checked.raw?.[k]))
  if (late || !checked.fields) {
    await rmStaged(file.path)
    throw field(late ?? 'kind', 'was sent after the file; send every field before the file')
  }
  return checked.fields
}

/**
 * Certificates of the course and of the timing equipment are the event's, attached to what they
 * certify: a survey by the organiser to a course, a calibration by the organiser or a timekeeper to
 * a timing system.
 */
function assertCertificateRole(access: EventAccess, f: Fields) {
  const may = (...roles: string[]) => access.asAdmin || access.roles.some(r => roles.includes(r))
  if (f.kind === 'survey-certificate' || f.courseId) {
    if (!may('organiser')) throw forbidden('Only the organiser attaches course certificates')
    if (f.kind === 'survey-certificate' && !f.courseId) throw field('courseId', 'name the course the survey certifies')
  }
  if (f.kind === 'calibration-certificate' || f.timingSystemId) {
    if (!may('organiser', 'timekeeper')) {
      throw forbidden('Only the organiser or a timekeeper attaches timing-system certificates')
    }
    if (f.kind === 'calibration-certificate' && !f.timingSystemId) {
      throw field('timingSystemId', 'name the timing system the calibration certifies')
    }
  }
}

/** Bytes a team may still store at this event (its files on its entries, attempts, runs, inspections). */
async function quotaLeft(access: EventAccess, teams: number[] | null) {
  if (!teams?.length) return Number.POSITIVE_INFINITY
  const quota = Number(useRuntimeConfig().teamQuotaBytes)
  const team = teams[0]!
  const { rows } = await useDb().execute<{ used: string }>(sql`
    select coalesce(sum(x.size), 0)::text as used from evidence x
    where x.event_id = ${access.eventId} and ${teamSql} = ${team}`)
  const used = Number(rows[0]!.used)
  if (used >= quota) {
    throw field('file', `the team's storage at this event is full: ${formatBytes(used)} of ${formatBytes(quota)} `
      + 'used; ask the organiser for room')
  }
  return quota - used
}

/** What the content is by its magic bytes: a media type, or "text" for content with none that reads as text. */
export async function sniff(head: Buffer): Promise<string | null> {
  const type = await fileTypeFromBuffer(head)
  if (type) return type.mime
  return head.length && !head.includes(0) ? TEXT : null
}

/**
 * Stores a staged upload under its hash, then writes its row in a short transaction holding a lock on
 * the hash: no database connection is held while the bytes move to the store. The row exists only
 * with its file (checked again under the lock), and a file stored for a failed row is removed unless
 * another row uses it.
 */
export async function commitEvidence(access: EventAccess, fields: Fields, file: StagedFile) {
  const store = useBlobStore()
  try {
    if (file.size === 0) throw field('file', 'is empty')
    const detected = await sniff(file.head)
    const rule = evidenceKinds[fields.kind as EvidenceKind]
    if (!detected || !rule.accepts.includes(detected)) {
      throw field(
        'file',
        `the content is ${detected ?? 'not a recognised type'}, not what a ${rule.label.toLowerCase()} may be `
        + `(${rule.accepts.map(a => (a === TEXT ? 'text' : a)).join(', ')})`,
      )
    }
    const mismatch = extensionMismatch(file.originalname, detected)
    if (mismatch) throw field('file', mismatch)
    const mediaType = detected === TEXT ? 'text/plain' : detected
    const existed = await store.has(file.sha256)
    if (!existed) await store.put(file.sha256, file.path, file.size, mediaType)
    return await useDb().transaction(async (tx) => {
      await tx.execute(sql`select pg_advisory_xact_lock(hashtextextended(${file.sha256}, 0))`)
      // Removed meanwhile by a failed upload of the same bytes: stored again (rare; the lock is short otherwise).
      if (!(await store.has(file.sha256))) await store.put(file.sha256, file.path, file.size, mediaType)
      try {
        const [row] = await tx
          .insert(tables.evidence)
          .values({
            eventId: access.eventId,
            kind: fields.kind,
            originalName: file.originalname,
            mediaType,
            size: file.size,
            sha256: file.sha256,
            courseId: fields.courseId,
            timingSystemId: fields.timingSystemId,
            entryId: fields.entryId,
            attemptId: fields.attemptId,
            runId: fields.runId,
            inspectionId: fields.inspectionId,
            itemKey: fields.itemKey,
            uploadedBy: access.user.id,
          })
          .returning()
        return { ...row!, storedBefore: existed }
      }
      catch (e) {
        const used = await useDb().execute(sql`select 1 from evidence where sha256 = ${file.sha256} limit 1`)
        if (!existed && !used.rows.length) await store.remove(file.sha256)
        throw e
      }
    })
  }
  finally {
    await rmStaged(file.path)
  }
}

const rmStaged = (path: string) => import('node:fs/promises').then(fs => fs.rm(path, { force: true }))

/** Evidence at an event as this person may see it: a team sees its own and the event-level files. */
export async function listEvidence(
  access: EventAccess,
  filter: { kind?: EvidenceKind, attemptId?: number, runId?: number, entryId?: number },
) {
  const { rows } = await useDb().execute<Record<string, unknown>>(sql`
    select x.*, u.name as uploaded_by_name, ${teamSql} as team_id
    from evidence x join users u on u.id = x.uploaded_by
    where x.event_id = ${access.eventId}
      ${filter.kind ? sql`and x.kind = ${filter.kind}` : sql``}
      ${filter.attemptId
        ? sql`and (x.attempt_id = ${filter.attemptId} or x.run_id in (select id from runs where
        attempt_id = ${filter.attemptId}))`
        : sql``}
      ${filter.runId ? sql`and x.run_id = ${filter.runId}` : sql``}
      ${filter.entryId ? sql`and x.entry_id = ${filter.entryId}` : sql``}
    order by x.id desc`)
  return rows
    .filter(r => !teamOnly(access) || r.team_id === null || access.teamIds.includes(r.team_id as number))
    .map(camel)
}

const teamSql = sql`coalesce(
  (select team_id from entries where id = x.entry_id),
  (select e.team_id from attempts a join entries e on e.id = a.entry_id where a.id = x.attempt_id),
  (select e.team_id from runs r join attempts a on a.id = r.attempt_id join entries e on e.id = a.entry_id
    where r.id = x.run_id),
  (select e.team_id from inspections i join entries e on e.id = i.entry_id where i.id = x.inspection_id))`

const camel = (r: Record<string, unknown>) =>
  Object.fromEntries(
    Object.entries(r).map(([k, v]) => [k.replace(/_([a-z])/g, (_, c: string) => c.toUpperCase()), v]),
  ) as {
    id: number
    eventId: number
    kind: EvidenceKind
    originalName: string
    mediaType: string
    size: string | number
    sha256: string
    uploadedByName: string
    uploadedAt: string
    teamId: number | null
    courseId: number | null
    timingSystemId: number | null
    entryId: number | null
    attemptId: number | null
    runId: number | null
    inspectionId: number | null
    itemKey: string | null
  }

/** One piece of evidence by id or by hash within an event, as this person may see it; else 404. */
export async function findEvidence(access: EventAccess, by: { id?: number, sha256?: string }) {
  const { rows } = await useDb().execute<Record<string, unknown>>(sql`
    select x.*, ${teamSql} as team_id from evidence x
    where x.event_id = ${access.eventId} and ${by.id ? sql`x.id = ${by.id}` : sql`x.sha256 = ${by.sha256}`}
    order by x.id desc limit 1`)
  const row = rows[0] ? camel(rows[0]) : null
  if (!row || (teamOnly(access) && row.teamId !== null && !access.teamIds.includes(row.teamId))) throw noSuchEvidence()
  return row
}
