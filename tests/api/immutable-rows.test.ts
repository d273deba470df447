import pg from 'pg'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { unique, useTestServer } from '../support/api'
import { newEntry } from '../support/entries'
import { newTestEvent } from '../support/test-event'

await useTestServer()

// Nothing signed, decided or frozen is rewritten, even by the app's own database role (what a bug or a stolen
// connection would use): PostgreSQL's triggers refuse UPDATE and DELETE of each such row; ending or revoking is a
// new row or a column set once. Every statement here runs as the app role; the rows are the demo's decided ones
// (read, never changed: each write below is refused) or rows of the test's own event. The list is DEVELOPERS.md's.
const app = new pg.Client({ connectionString: JSON.parse(inject('serverEnv')).databaseUrl })
const owner = new pg.Client({ connectionString: inject('databaseUrl') })
await app.connect()
await owner.connect()
afterAll(async () => {
  await app.end()
  await owner.end()
})

const first = async (sql: string, args: unknown[] = []) => {
  const row = (await owner.query(sql, args)).rows[0]
  expect(row, sql).toBeTruthy()
  return row.id as number
}
const id = {} as Record<string, number>
let sealKey = ''

beforeAll(async () => {
  id.protest = await first('select id from protests where decided_at is not null and decision_signature_id is not null limit 1')
  id.signOn = await first('select id from briefing_sign_ons where signature_id is not null limit 1')
  id.appointment = await first('select id from appointments limit 1')
  id.attempt = await first('select id from attempts limit 1')
  id.ratifiedRecord = await first('select id from standing_records where dossier_id is not null limit 1')
  id.decision = await first('select id from decisions limit 1')
  id.dossier = await first('select id from dossiers limit 1')
  id.signature = await first('select id from signatures limit 1')
  id.reading = await first('select id from readings limit 1')
  id.homologation = await first('select id from homologations limit 1')
  id.inspection = await first('select id from inspections where signature_id is not null limit 1')
  sealKey = (await owner.query('select key_id from seal_keys limit 1')).rows[0].key_id
  // Rows of the test's own event, written as the app writes them (unsigned first, then signed once).
  const event = await newTestEvent('intl-motorcycle', 'UTC')
  const entryId = await newEntry(event.eventId, 'Row machine', {}, { team: event.cookie.team })
  const user = await first('insert into users (email, name) values ($1, $2) returning id', [unique('rows'), 'Row Person'])
  id.user = user
  id.notice = await first(`insert into notices (event_id, title, body, issued_by) values ($1, 'Course open', 'From 07:00.', $2) returning id`, [event.eventId, user])
  id.override = await first(`insert into start_overrides (event_id, entry_id, day, codes, reason, created_by) values ($1, $2, '2026-12-05', '{}', 'test', $3) returning id`, [event.eventId, entryId, user])
  id.ownAppointment = await first(`insert into appointments (event_id, function, user_id, appointed_by) values ($1, 'observer', $2, $2) returning id`, [event.eventId, user])
  id.passkey = await first(`insert into passkeys (user_id, credential_id, public_key, name) values ($1, $2, 'cHVibGlj', 'Row key') returning id`, [user, unique('cred')])
}, 120_000)

describe('rows that are never rewritten, as the app role', () => {
  it.each([
    ['protests: a decision', () => `update protests set outcome = 'upheld' where id = ${id.protest}`, /decided once/],
    ['protests: the grounds', () => `update protests set grounds = grounds || '.' where id = ${id.protest}`, /never edited/],
    ['protests: deleted', () => `delete from protests where id = ${id.protest}`, /never deleted/],
    ['briefing sign-ons', () => `update briefing_sign_ons set name = 'Someone else' where id = ${id.signOn}`, /immutable/],
    ['briefing sign-ons: deleted', () => `delete from briefing_sign_ons where id = ${id.signOn}`, /immutable/],
    ['appointments: another person', () => `update appointments set appointed_at = appointed_at - interval '1 day' where id = ${id.appointment}`, /only ended, once/],
    ['appointments: deleted', () => `delete from appointments where id = ${id.appointment}`, /never deleted/],
    ['attempts: the frozen profile', () => `update attempts set profile = profile || '{"name":"x"}' where id = ${id.attempt}`, /frozen/],
    ['attempts: deleted', () => `delete from attempts where id = ${id.attempt}`, /never deleted/],
    ['standing records: a ratified one', () => `update standing_records set speed = speed + 1 where id = ${id.ratifiedRecord}`, /never edited/],
    ['standing records: deleted', () => `delete from standing_records where id = ${id.ratifiedRecord}`, /never deleted/],
    ['seal keys: the public key', () => `update seal_keys set public_key_pem = 'x' where key_id = '${sealKey}'`, /only retired, once/],
    ['seal keys: deleted', () => `delete from seal_keys where key_id = '${sealKey}'`, /append-only/],
    ['decisions', () => `update decisions set decision = 'refused' where id = ${id.decision}`, /append-only/],
    ['dossiers', () => `update dossiers set version = version where id = ${id.dossier}`, /append-only/],
    ['signatures', () => `update signatures set typed_name = 'x' where id = ${id.signature}`, /append-only/],
    ['readings', () => `delete from readings where id = ${id.reading}`, /append-only/],
    ['homologations', () => `update homologations set reference = 'x' where id = ${id.homologation}`, /immutable/],
    ['inspections, signed', () => `delete from inspections where id = ${id.inspection}`, /immutable/],
  ])('%s: refused', async (_, sql, why) => {
    await expect(app.query(sql())).rejects.toThrow(why)
  })

  it('a row of the test\'s own is signed once, then fixed; an appointment ends once; a passkey keeps its key', async () => {
    // Unsigned, the app sets the signature; once signed, nothing more.
    for (const table of ['notices', 'start_overrides'] as const) {
      const row = table === 'notices' ? id.notice : id.override
      await app.query(`update ${table} set signature_id = ${id.signature} where id = ${row}`)
      await expect(app.query(`update ${table} set signature_id = null where id = ${row}`)).rejects.toThrow(/immutable/)
      await expect(app.query(`delete from ${table} where id = ${row}`)).rejects.toThrow(/immutable/)
    }
    await app.query(`update appointments set ended_at = now(), end_reason = 'left the event' where id = ${id.ownAppointment}`)
    await expect(app.query(`update appointments set ended_at = null where id = ${id.ownAppointment}`)).rejects.toThrow(/only ended, once/)
    // Its use counter moves; its owner and public key never do, and it is never deleted.
    await app.query(`update passkeys set counter = counter + 1 where id = ${id.passkey}`)
    await expect(app.query(`update passkeys set public_key = 'b3RoZXI' where id = ${id.passkey}`)).rejects.toThrow(/never change/)
    await expect(app.query(`update passkeys set user_id = ${id.user} + 0, credential_id = 'x' where id = ${id.passkey}`)).rejects.toThrow(/never change/)
    await expect(app.query(`delete from passkeys where id = ${id.passkey}`)).rejects.toThrow(/append-only/)
    expect((await owner.query('select counter, public_key from passkeys where id = $1', [id.passkey])).rows[0]).toEqual({ counter: 1, public_key: 'cHVibGlj' })
  })
})
