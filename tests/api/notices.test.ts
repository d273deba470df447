import { beforeAll, expect, it } from 'vitest'
import { call, mailTo, url, useTestServer } from '../support/api'
import { clearedEntry } from '../support/entries'
import { pdfText } from '../support/pdf-tools'
import { makeReady } from '../support/ready-attempt'
import { kilometreRun } from '../support/runs'
import { newTestEvent, type TestEvent } from '../support/test-event'

await useTestServer()

// Official notices: published with their time, signed by the issuer, mailed to the teams, and listed in the
// dossier of the attempt they concern (with the event's general ones). Invented set-up and times.
let event: TestEvent
let attemptId: number
let entryId: number
let runIds: number[]
beforeAll(async () => {
  event = await newTestEvent('intl-motorcycle', 'UTC')
  entryId = await clearedEntry(event.eventId, 'Notice Sprite', {}, {
    team: event.cookie.team, scrutineer: event.cookie.scrutineer, scrutineerPassword: 'first-password-1',
  })
  const place = { eventId: event.eventId, timeZone: event.timeZone, timekeeper: event.cookie.timekeeper, traps: event.traps, systems: event.systems }
  // The kilometre in 8.9 s (404.494 km/h, over the test record of 400.000), after the inspection was signed.
  const quick = { primary: [0, 8.9] as [number, number], backup: [0, 8.9] as [number, number] }
  const start = Math.ceil(Date.now() / 1000) * 1000 + 1000
  const out = await kilometreRun(place, entryId, 'out', start, quick)
  const back = await kilometreRun(place, entryId, 'back', start + 120_000, quick)
  attemptId = out.attemptId
  runIds = [out.id, back.id]
})

const publish = (cookie: string, body: Record<string, unknown>) =>
  call('POST', `/api/events/${event.eventId}/notices`, { cookie, body: { password: 'first-password-1', ...body } })

it('publishes signed notices to the board and mails the teams; a team cannot publish; the name must be the signer\'s', async () => {
  expect((await publish(event.cookie.team, { title: 'Not mine', body: 'a team does not issue notices', typedName: 'Test team' })).status).toBe(403)
  const wrongName = await publish(event.cookie.official, { title: 'Schedule', body: 'later start', typedName: 'Someone Else' })
  expect(wrongName.status).toBe(422)
  expect(wrongName.body.data.issues[0].path).toBe('typedName')
  const general = await publish(event.cookie.official, {
    title: 'Course closed 12:00 to 13:00', body: 'Wind above the limit: the course closes for an hour.', typedName: 'Test official',
  })
  expect(general.status, JSON.stringify(general.body)).toBe(201)
  const decision = await publish(event.cookie.organiser, {
    title: 'Return run allowed after the closure', body: 'The window of this attempt runs on.', attemptId, typedName: 'Test Organiser',
    password: event.organiserLogin[1],
  })
  expect(decision.status, JSON.stringify(decision.body)).toBe(201)
  const board = (await call('GET', `/api/events/${event.eventId}/notices`, { cookie: event.cookie.team })).body
  expect(board.map((n: { title: string }) => n.title)).toEqual(['Course closed 12:00 to 13:00', 'Return run allowed after the closure'])
  expect(board[1]).toMatchObject({ attemptId, typedName: 'Test Organiser', issuer: 'Test Organiser' })
  const signature = (await call('GET', `/api/signatures/${board[0].signatureId}`, { cookie: event.cookie.official })).body
  expect(signature).toMatchObject({ kind: 'notice', storedContentMatches: true, recordStillMatches: true })
  const teamEmail = (await call('GET', '/api/me', { cookie: event.cookie.team })).body.user.email
  const mail = await mailTo(teamEmail, 'Official notice: Course closed')
  expect(mail.text).toContain('Wind above the limit')
  // An attempt of another event is not this event's.
  expect((await publish(event.cookie.official, { title: 'Elsewhere', body: 'not for this event', attemptId: 1, typedName: 'Test official' })).body.data?.issues?.[0]?.path)
    .toBe('attemptId')
})

it('lists the attempt\'s notices and the general ones in its dossier', async () => {
  await makeReady(event, attemptId, runIds, entryId)
  const issued = await call('POST', `/api/attempts/${attemptId}/dossiers`, { cookie: event.cookie.team })
  expect(issued.status, JSON.stringify(issued.body)).toBe(201)
  const bytes = new Uint8Array(await (await fetch(url(`/api/dossiers/${issued.body.id}/pdf`), { headers: { cookie: event.cookie.team } })).arrayBuffer())
  const text = (await pdfText(bytes, 'notices-dossier.pdf')).replace(/\s+/g, ' ')
  expect(text).toContain('Official notices')
  expect(text).toContain('to the whole event: Course closed 12:00 to 13:00')
  expect(text).toContain(`on attempt #${attemptId}: Return run allowed after the closure`)
})
