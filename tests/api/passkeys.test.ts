import { beforeAll, describe, expect, inject, it } from 'vitest'
import { call, mailTo, useTestServer } from '../support/api'
import { softwarePasskey } from '../support/authenticator'
import { answerAll, clearedEntry, FIGURES, newEntry } from '../support/entries'
import { kilometreRun, minutesAgo } from '../support/runs'
import { newTestEvent, type TestEvent } from '../support/test-event'

await useTestServer()
let event: TestEvent
// The site's own origin (NUXT_SITE_URL of the test server): the relying party a passkey is bound to.
const origin = new URL(inject('baseUrl')).origin
const keys = { scrutineer: softwarePasskey(origin), official: softwarePasskey(origin) }

beforeAll(async () => {
  event = await newTestEvent('intl-motorcycle', 'UTC')
})

/** Registers a software passkey for the signed-in person, as the account page does. */
async function register(cookie: string, key: ReturnType<typeof softwarePasskey>, name: string) {
  const options = await call('POST', '/api/me/passkeys/options', { cookie })
  expect(options.status).toBe(200)
  return call('POST', '/api/me/passkeys', { cookie, body: { name, password: 'first-password-1', response: key.register(options.body) } })
}

describe('passkeys sign exactly the content', { shuffle: false }, () => {
  let inspectionId = 0

  it('a scrutineer registers a passkey with the password, and is mailed; a registration challenge is used once', async () => {
    const options = await call('POST', '/api/me/passkeys/options', { cookie: event.cookie.scrutineer })
    const response = keys.scrutineer.register(options.body)
    // A session alone adds no way to sign: the password is asked, and a wrong one refused, naming the field.
    const bare = await call('POST', '/api/me/passkeys', { cookie: event.cookie.scrutineer, body: { name: 'scrutineering tablet', response } })
    expect(bare.status).toBe(422)
    expect(bare.body.data.issues[0].path).toBe('password')
    const wrong = await call('POST', '/api/me/passkeys', { cookie: event.cookie.scrutineer, body: { name: 'scrutineering tablet', password: 'not-it-at-all', response } })
    expect(wrong.status).toBe(422)
    expect(wrong.body.data.issues[0].path).toBe('password')
    const created = await call('POST', '/api/me/passkeys', { cookie: event.cookie.scrutineer, body: { name: 'scrutineering tablet', password: 'first-password-1', response } })
    expect(created.status, JSON.stringify(created.body)).toBe(201)
    const mail = await mailTo(event.email.scrutineer, 'passkey "scrutineering tablet" added')
    expect(mail.text).toContain('revoke it on your account page')
    const again = await call('POST', '/api/me/passkeys', { cookie: event.cookie.scrutineer, body: { name: 'again', password: 'first-password-1', response } })
    expect(again.status).toBe(409)
    const list = (await call('GET', '/api/me/passkeys', { cookie: event.cookie.scrutineer })).body
    expect(list.map((p: any) => p.name)).toEqual(['scrutineering tablet'])
  })

  it('an inspection changed after the challenge is not signed; signed over what is stored, it holds', async () => {
    const entryId = await newEntry(event.eventId, 'Passkey Runner', {}, { team: event.cookie.team })
    const started = await call('POST', `/api/events/${event.eventId}/inspections`, { cookie: event.cookie.scrutineer, body: { entryId, baseId: 'electric-motorcycle' } })
    inspectionId = started.body.id
    await call('PATCH', `/api/inspections/${inspectionId}`, { cookie: event.cookie.scrutineer, body: FIGURES })
    await answerAll(inspectionId, undefined, { scrutineer: event.cookie.scrutineer })
    const options = async () => (await call('POST', `/api/inspections/${inspectionId}/signing-options`, { cookie: event.cookie.scrutineer })).body
    const sign = (passkey: unknown) => call('POST', `/api/inspections/${inspectionId}/signatures`, {
      cookie: event.cookie.scrutineer, body: { typedName: 'Test scrutineer', passkey },
    })
    // The challenge is the content's SHA-256; a note added meanwhile changes the content.
    const stale = keys.scrutineer.assert(await options())
    await call('POST', `/api/inspections/${inspectionId}/answers`, { cookie: event.cookie.scrutineer, body: { itemKey: 'helmet', result: 'pass', note: 'visor replaced' } })
    const refused = await sign(stale)
    expect(refused.status).toBe(422)
    expect(refused.body.data.issues[0]).toMatchObject({ path: 'passkey' })
    expect(refused.body.data.issues[0].message).toContain('signed other content than is stored now')
    const signed = await sign(keys.scrutineer.assert(await options()))
    expect(signed.status, JSON.stringify(signed.body)).toBe(201)
    const report = (await call('GET', `/api/signatures/${signed.body.id}`, { cookie: event.cookie.official })).body
    expect(report).toMatchObject({ kind: 'inspection', method: 'passkey', passkeyHolds: true, recordStillMatches: true })
    expect(report.assertion.credentialId).toBe(keys.scrutineer.credentialId)
  })

  it('without a passkey or a password nothing is signed; the password stays the fallback', async () => {
    const entryId = await newEntry(event.eventId, 'Password Runner', {}, { team: event.cookie.team })
    const started = await call('POST', `/api/events/${event.eventId}/inspections`, { cookie: event.cookie.scrutineer, body: { entryId, baseId: 'electric-motorcycle' } })
    await call('PATCH', `/api/inspections/${started.body.id}`, { cookie: event.cookie.scrutineer, body: FIGURES })
    await answerAll(started.body.id, undefined, { scrutineer: event.cookie.scrutineer })
    // The official has no passkey: asking for signing options says so.
    const none = await call('POST', `/api/events/${event.eventId}/statements/signing-options`, {
      cookie: event.cookie.official, body: { attemptId: 1, runsSeen: 'x', position: 'y', conditions: 'z' },
    })
    expect(none.status).toBe(409)
    const bare = await call('POST', `/api/inspections/${started.body.id}/signatures`, { cookie: event.cookie.scrutineer, body: { typedName: 'Test scrutineer' } })
    expect(bare.status).toBe(422)
    expect(bare.body.data.issues[0]).toMatchObject({ path: 'password' })
    const byPassword = await call('POST', `/api/inspections/${started.body.id}/signatures`, { cookie: event.cookie.scrutineer, body: { typedName: 'Test scrutineer', password: 'first-password-1' } })
    expect(byPassword.status).toBe(201)
    const report = (await call('GET', `/api/signatures/${byPassword.body.id}`, { cookie: event.cookie.official })).body
    expect(report).toMatchObject({ method: 'password', passkeyHolds: null })
  })

  it('an official signs a witness statement with a passkey before it is written', async () => {
    expect((await register(event.cookie.official, keys.official, 'official phone')).status).toBe(201)
    // An attempt to witness: a cleared entry's run.
    const entryId = await clearedEntry(event.eventId, 'Witnessed Runner', {}, { team: event.cookie.team, scrutineer: event.cookie.scrutineer, scrutineerPassword: 'first-password-1' })
    const run = await call('POST', `/api/events/${event.eventId}/runs`, { cookie: event.cookie.timekeeper, body: { entryId, direction: 'out' } })
    expect(run.status).toBe(201)
    const attemptId = run.body.attemptId
    const draft = { attemptId, runsSeen: 'both runs', position: 'at the exit trap', conditions: 'calm, dry' }
    const options = await call('POST', `/api/events/${event.eventId}/statements/signing-options`, { cookie: event.cookie.official, body: draft })
    expect(options.status).toBe(200)
    // Someone else's passkey (the scrutineer's) answering the official's challenge signs nothing.
    const foreign = await call('POST', `/api/events/${event.eventId}/statements`, {
      cookie: event.cookie.official, body: { ...draft, typedName: 'Test official', passkey: keys.scrutineer.assert(options.body) },
    })
    expect(foreign.status).toBe(422)
    expect(foreign.body.data.issues[0]).toMatchObject({ path: 'passkey', message: 'is not one of your passkeys; nothing was signed' })
    const created = await call('POST', `/api/events/${event.eventId}/statements`, {
      cookie: event.cookie.official, body: { ...draft, typedName: 'Test official', passkey: keys.official.assert(options.body) },
    })
    expect(created.status, JSON.stringify(created.body)).toBe(201)
    const report = (await call('GET', `/api/signatures/${created.body.signatureId}`, { cookie: event.cookie.official })).body
    expect(report).toMatchObject({ kind: 'statement', method: 'passkey', passkeyHolds: true })
  })

  it('an answer counts once, for the act and signer it was issued to: a replay signs nothing', async () => {
    const timekeeper = softwarePasskey(origin)
    expect((await register(event.cookie.timekeeper, timekeeper, 'timing hut laptop')).status).toBe(201)
    const entryId = await clearedEntry(event.eventId, 'Replayed Runner', {}, { team: event.cookie.team, scrutineer: event.cookie.scrutineer, scrutineerPassword: 'first-password-1' })
    const place = { eventId: event.eventId, timeZone: event.timeZone, timekeeper: event.cookie.timekeeper, traps: event.traps, systems: event.systems }
    const run = await kilometreRun(place, entryId, 'out', minutesAgo(5), { primary: [0, 9], backup: [0, 9] })
    const options = async () => (await call('POST', `/api/attempts/${run.attemptId}/signing-options`, { cookie: event.cookie.timekeeper })).body
    const sign = (passkey: unknown) => call('POST', `/api/attempts/${run.attemptId}/signatures`, { cookie: event.cookie.timekeeper, body: { typedName: 'Test timekeeper', passkey } })
    const answer = timekeeper.assert(await options())
    const first = await sign(answer)
    expect(first.status, JSON.stringify(first.body)).toBe(201)
    // Reopened with the password: the sheet's content is the same, and so would its digest be, but the challenge
    // was issued once; the same answer again signs nothing.
    const reopened = await call('POST', `/api/attempts/${run.attemptId}/reopen`, { cookie: event.cookie.timekeeper, body: { typedName: 'Test timekeeper', password: 'first-password-1', reason: 'a reading to check' } })
    expect(reopened.status, JSON.stringify(reopened.body)).toBe(201)
    const replay = await sign(answer)
    expect(replay.status).toBe(422)
    expect(replay.body.data.issues[0]).toEqual({ path: 'passkey', message: 'answers a challenge already used: a passkey\'s answer counts once; nothing was signed' })
    // A challenge the client made up: not issued, nothing signed.
    const madeUp = await sign(timekeeper.assert({ challenge: 'bm90LWlzc3VlZC1ieS10aGUtc2VydmVy' }))
    expect(madeUp.status).toBe(422)
    expect(madeUp.body.data.issues[0].message).toBe('answers a challenge this server did not issue to you; nothing was signed')
    const fresh = await sign(timekeeper.assert(await options()))
    expect(fresh.status, JSON.stringify(fresh.body)).toBe(201)
  })

  it('the owner revokes a passkey with the password: it signs nothing more, and what it signed still holds', async () => {
    const list = (await call('GET', '/api/me/passkeys', { cookie: event.cookie.scrutineer })).body
    const key = list.find((p: { name: string }) => p.name === 'scrutineering tablet')
    const revoke = (body: Record<string, unknown>) => call('POST', `/api/me/passkeys/${key.id}/revocation`, { cookie: event.cookie.scrutineer, body })
    expect((await revoke({ reason: 'tablet lost', password: 'wrong-one' })).body.data.issues[0].path).toBe('password')
    // Not another person's passkey.
    expect((await call('POST', `/api/me/passkeys/${key.id}/revocation`, { cookie: event.cookie.official, body: { reason: 'not mine', password: 'first-password-1' } })).status).toBe(404)
    const revoked = await revoke({ reason: 'tablet lost', password: 'first-password-1' })
    expect(revoked.status, JSON.stringify(revoked.body)).toBe(201)
    expect((await revoke({ reason: 'tablet lost', password: 'first-password-1' })).status).toBe(409)
    await mailTo(event.email.scrutineer, 'revoked')
    expect((await call('GET', '/api/me/passkeys', { cookie: event.cookie.scrutineer })).body
      .find((p: { id: number }) => p.id === key.id).revokedAt).toBeTruthy()
    // No passkey left to sign with; the signature it made before still holds with its kept public key.
    const none = await call('POST', `/api/inspections/${inspectionId}/signing-options`, { cookie: event.cookie.scrutineer })
    expect(none.status).toBe(409)
    expect(none.body.statusMessage).toContain('You have no passkey')
    const signed = (await call('GET', `/api/inspections/${inspectionId}`, { cookie: event.cookie.scrutineer })).body.signature
    expect((await call('GET', `/api/signatures/${signed.id}`, { cookie: event.cookie.official })).body).toMatchObject({ method: 'passkey', passkeyHolds: true })
  })
})
