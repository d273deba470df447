import { beforeAll, describe, expect, it } from 'vitest'
import { call, url, useTestServer } from '../support/api'
import { clearedEntry } from '../support/entries'
import { pdfText } from '../support/pdf-tools'
import { makeReady } from '../support/ready-attempt'
import { kilometreRun } from '../support/runs'
import { newTestEvent, type TestEvent } from '../support/test-event'

await useTestServer()

// The stewards confirm a result only once it can no longer be protested: after the protest period of its publication
// (the signed timing sheet, and the inspection), every protest and appeal decided (sporting codes: results stay
// provisional until then; common practice, from memory). The international profile's period is 30 min and its
// stewards decide two of three (both from memory of the sporting codes); the edges of the period to the millisecond
// are in the unit tests. The test server judges by the instant a test gives it (x-trapline-now). Invented set-up.
const idOf = async (cookie: string) => (await call('GET', '/api/me', { cookie })).body.user.id as number
const sign = (name: string) => ({ password: 'first-password-1', typedName: name })

let event: TestEvent
let attemptId = 0
let outStartMs = 0
let second = { cookie: '', name: '' }
const confirm = (cookie: string, name: string, now?: Date) =>
  call('POST', `/api/attempts/${attemptId}/confirmations`, { cookie, now, body: sign(name) })
const readiness = async () => (await call('GET', `/api/attempts/${attemptId}/readiness`, { cookie: event.cookie.team })).body
const item = async () => (await readiness()).items.find((i: { key: string }) => i.key === 'confirmation')

beforeAll(async () => {
  event = await newTestEvent('intl-motorcycle', 'Europe/Paris')
  const entryId = await clearedEntry(event.eventId, 'Confirmation machine', {}, {
    team: event.cookie.team, scrutineer: event.cookie.scrutineer, scrutineerPassword: 'first-password-1',
  })
  const place = { eventId: event.eventId, timeZone: event.timeZone, timekeeper: event.cookie.timekeeper, traps: event.traps, systems: event.systems }
  const both = { primary: [0, 8.9] as [number, number], backup: [0, 8.9] as [number, number] }
  const t0 = Math.ceil(Date.now() / 1000) * 1000 + 1000
  const out = await kilometreRun(place, entryId, 'out', t0, both)
  const back = await kilometreRun(place, entryId, 'back', t0 + 120_000, both)
  attemptId = out.attemptId
  outStartMs = t0
  second = (await makeReady(event, attemptId, [out.id, back.id], entryId, { confirm: false })).second
}, 120_000)

describe('the stewards\' confirmation of a result, after the protest period', { shuffle: false }, () => {
  let after = ''
  let firstSignature = 0
  it('is what the dossier still lacks, with the instant the protest period ends on the event\'s clock', async () => {
    const r = await readiness()
    expect(r.ready).toBe(false)
    expect(r.items.filter((i: { met: boolean }) => !i.met).map((i: { key: string }) => i.key)).toEqual(['confirmation'])
    after = r.confirmation.after
    // Published when the timing sheet was signed; 30 min later (from memory of the sporting codes).
    const sheet = (await call('GET', `/api/attempts/${attemptId}/timing-sheet`, { cookie: event.cookie.organiser })).body
    const signedAt = Date.parse(sheet.signatures.at(-1).at)
    expect(Date.parse(after) - signedAt).toBe(30 * 60_000)
    expect(r.confirmation).toMatchObject({ required: true, quorum: 2, confirmed: false, signers: [] })
    expect(r.confirmation.afterClock).toMatch(/^\d\d:\d\d on \d{4}-\d\d-\d\d \(Europe\/Paris\)$/)
    expect((await item()).detail).toBe(`not yet: the protest and appeal periods run until ${r.confirmation.afterClock}; `
      + 'then 2 appointed stewards sign it')
    const built = await call('POST', `/api/attempts/${attemptId}/dossiers`, { cookie: event.cookie.team })
    expect(built.status).toBe(422)
    expect(built.body.message).toBe('not ready: The stewards\' confirmation of the result, after the protest and appeal periods')
  })

  it('is signed only by an appointed steward: the team and an official who is not one are refused', async () => {
    expect((await confirm(event.cookie.team, 'Test team')).status).toBe(403)
    const notSteward = await confirm(event.cookie.official, 'Test official')
    expect(notSteward.status).toBe(403)
    expect(notSteward.body.statusMessage).toBe('Only a steward appointed at this event signs the confirmation of a '
      + 'result: it is a decision of the stewards')
    for (const cookie of [event.cookie.official, second.cookie]) {
      const a = await call('POST', `/api/events/${event.eventId}/appointments`, { cookie: event.cookie.organiser, body: { function: 'steward', userId: await idOf(cookie) } })
      expect(a.status, JSON.stringify(a.body)).toBe(201)
    }
  })

  it('is refused while the protest period runs, up to its last millisecond, and nothing is signed', async () => {
    const { afterClock } = (await readiness()).confirmation
    const now = await confirm(event.cookie.official, 'Test official')
    expect(now.status).toBe(409)
    expect(now.body.statusMessage).toBe(`Not yet: the protest and appeal periods run until ${afterClock}`)
    expect(now.body.data.after).toBe(after)
    // A protest lodged at the deadline is in time, so the deadline itself is still inside the period.
    expect((await confirm(event.cookie.official, 'Test official', new Date(after))).status).toBe(409)
    expect((await readiness()).confirmation.signers).toEqual([])
  })

  it('takes effect with the quorum: one steward signs, then the second; nobody signs twice or after', async () => {
    const just = new Date(Date.parse(after) + 1)
    const first = await confirm(event.cookie.official, 'Test official', just)
    expect(first.status, JSON.stringify(first.body)).toBe(201)
    expect(first.body).toMatchObject({ signers: 1, quorum: 2, confirmed: false })
    expect((await item())).toMatchObject({ met: false, detail: 'confirmed by Test official; 1 more steward(s) to sign' })
    const again = await confirm(event.cookie.official, 'Test official', just)
    expect(again.status).toBe(409)
    expect(again.body.statusMessage).toBe('You have already confirmed this result')
    const done = await confirm(second.cookie, 'Second official', just)
    expect(done.status, JSON.stringify(done.body)).toBe(201)
    expect(done.body).toMatchObject({ signers: 2, quorum: 2, confirmed: true })
    expect(await item()).toMatchObject({ met: true, detail: 'confirmed by Test official and Second official' })
    expect((await readiness()).ready).toBe(true)
    const third = await confirm(event.cookie.official, 'Test official', just)
    expect(third.status).toBe(409)
    firstSignature = first.body.signatureId
    const report = (await call('GET', `/api/signatures/${firstSignature}`, { cookie: event.cookie.team })).body
    expect(report).toMatchObject({ kind: 'confirmation', signedBy: 'Test official', storedContentMatches: true, recordStillMatches: true })
    expect(report.title).toBe(`The stewards' confirmation of the result of attempt #${attemptId}`)
  })

  it('goes into the sealed dossier with each steward\'s name', async () => {
    const built = await call('POST', `/api/attempts/${attemptId}/dossiers`, { cookie: event.cookie.team })
    expect(built.status, JSON.stringify(built.body)).toBe(201)
    const pdf = new Uint8Array(await (await fetch(url(`/api/dossiers/${built.body.id}/pdf`), { headers: { cookie: event.cookie.team } })).arrayBuffer())
    const text = (await pdfText(pdf, 'confirmed.pdf')).replace(/\s+/g, ' ')
    expect(text).toContain('Confirmation of the result by the stewards')
    // Each timing system's clock, and how it was set (not recorded for the test event's systems).
    expect(text).toMatch(/: its clock shows the event's local time \(Europe\/Paris\); how and when it was set is not recorded\./)
    expect(text).toContain(`Confirmed after the protest and appeal periods, which ended at ${(await readiness()).confirmation.afterClock}; 2 steward(s) sign under the profile.`)
    expect(text).toMatch(/Test official, \d{4}-\d\d-\d\d \d\d:\d\d(:\d\d)? UTC; SHA-256 [0-9a-f]{64}/)
    expect(text).toMatch(/Second official, \d{4}-\d\d-\d\d \d\d:\d\d(:\d\d)? UTC; SHA-256 [0-9a-f]{64}/)
    // Every time with its zone: the run's start on the event's clock first (the platform's ICU time zone data,
    // a reference independent of the product's own zone code), UTC beside it; the trap times say whose clock.
    const local = new Date(outStartMs).toLocaleString('sv-SE', { timeZone: 'Europe/Paris', hourCycle: 'h23' })
    const utc = new Date(outStartMs).toISOString().replace('T', ' ').slice(0, 19)
    expect(text).toContain(`, out, started ${local} (Europe/Paris), ${utc} UTC`)
    expect(text).toContain('Times of day on each system\'s clock: the event\'s local time (Europe/Paris) unless marked UTC.')
  })

  it('no longer counts once the timing sheet is reopened: the new publication opens a new period', async () => {
    const reopened = await call('POST', `/api/attempts/${attemptId}/reopen`, { cookie: event.cookie.timekeeper, body: { ...sign('Test timekeeper'), reason: 'the backup printout to compare again' } })
    expect(reopened.status, JSON.stringify(reopened.body)).toBe(201)
    const signed = await call('POST', `/api/attempts/${attemptId}/signatures`, { cookie: event.cookie.timekeeper, body: sign('Test timekeeper') })
    expect(signed.status, JSON.stringify(signed.body)).toBe(201)
    const r = await readiness()
    expect(r.confirmation).toMatchObject({ confirmed: false, signers: [] })
    expect(Date.parse(r.confirmation.after)).toBeGreaterThan(Date.parse(after))
    expect((await item()).met).toBe(false)
    // What that steward signed no longer matches the record as it is: another signing of the sheet.
    const report = (await call('GET', `/api/signatures/${firstSignature}`, { cookie: event.cookie.team })).body
    expect(report).toMatchObject({ storedContentMatches: true, recordStillMatches: false })
    // The same steward confirms the newly signed sheet once its own period is over.
    const again = await confirm(event.cookie.official, 'Test official', new Date(Date.parse(r.confirmation.after) + 1))
    expect(again.status, JSON.stringify(again.body)).toBe(201)
    expect(again.body.signers).toBe(1)
  })
})
