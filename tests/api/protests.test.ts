import { describe, expect, it } from 'vitest'
import { call, demoEmail, demoEventId, invitedPerson, login, mailTo, url, useTestServer } from '../support/api'
import { clearedEntry } from '../support/entries'
import { pdfText } from '../support/pdf-tools'
import { confirmByStewards, makeReady } from '../support/ready-attempt'
import { kilometreRun } from '../support/runs'
import { newTestEvent, type TestEvent } from '../support/test-event'
import { addDays, localDate, localDateTime } from '#shared/rules/zoned'

await useTestServer()

// Protests and appeals: lodged by a team within the profile's deadline after publication (the signed timing
// sheet), counted in the event's zone and shown as clock times; heard and decided by a steward, with reasons,
// signed; appealed by a party within the appeal deadline. While one is open the claim is not ratified; the
// decisions go into the dossier. The deadlines here are the organiser's adapted values; the international
// profile's own (30 min, from memory of the sporting codes) are checked in the unit tests. Invented set-up.
const idOf = async (cookie: string) => (await call('GET', '/api/me', { cookie })).body.user.id as number
const sign = (name: string) => ({ password: 'first-password-1', typedName: name })

/** The fixed-offset zone (IANA "Etc/GMT±N", whose sign is inverted) in which it is now the given local hour. */
function zoneAtHour(hour: number) {
  let n = (hour - new Date().getUTCHours() + 24) % 24
  if (n > 14) n -= 24
  return n === 0 ? 'Etc/GMT' : n > 0 ? `Etc/GMT-${n}` : `Etc/GMT+${-n}`
}

/** A test event whose organiser adapted the protest rule; a cleared entry's pair in, published (sheet signed). */
async function publishedAttempt(zone: string, adapt: Record<string, unknown>, name: string) {
  const event = await newTestEvent('intl-motorcycle', zone)
  const adapted = await call('PUT', `/api/events/${event.eventId}/profile`, {
    cookie: event.cookie.organiser, body: { baseId: 'intl-motorcycle', source: 'test rulebook, art. 9', ...adapt },
  })
  expect(adapted.status, JSON.stringify(adapted.body)).toBe(200)
  // The riders' briefing an hour ago; the rider signs on in person on the organiser's device (the entry helper).
  const briefing = await call('POST', `/api/events/${event.eventId}/briefings`, {
    cookie: event.cookie.organiser,
    body: { title: 'Riders\' briefing', heldAt: new Date(Date.now() - 3_600_000).toISOString() },
  })
  expect(briefing.status).toBe(201)
  const entryId = await clearedEntry(event.eventId, name, {}, {
    team: event.cookie.team, scrutineer: event.cookie.scrutineer, scrutineerPassword: 'first-password-1',
  })
  const place = { eventId: event.eventId, timeZone: zone, timekeeper: event.cookie.timekeeper, traps: event.traps, systems: event.systems }
  const quick = { primary: [0, 8.9] as [number, number], backup: [0, 8.9] as [number, number] } // 404.494 km/h
  const t0 = Math.ceil(Date.now() / 1000) * 1000 + 1000
  const out = await kilometreRun(place, entryId, 'out', t0, quick)
  const back = await kilometreRun(place, entryId, 'back', t0 + 120_000, quick)
  const { second } = await makeReady(event, out.attemptId, [out.id, back.id], entryId)
  return { event, attemptId: out.attemptId, entryId, second }
}

const lodge = (event: TestEvent, body: Record<string, unknown>) =>
  call('POST', `/api/events/${event.eventId}/protests`, { cookie: event.cookie.team, body: { ...sign('Test team'), ...body } })

describe('a protest lodged in time, across a change of day, heard, decided and appealed', () => {
  it('runs from lodging to the ratified claim with the decisions in its dossier', async () => {
    // At 22:xx local, protests within (minutes to midnight + 10) fall due at about 00:10 the next local day.
    const zone = zoneAtHour(22)
    const local = localDateTime(Date.now(), zone)
    const toMidnight = 24 * 60 - (Number(local.slice(11, 13)) * 60 + Number(local.slice(14, 16)))
    const { event, attemptId, second } = await publishedAttempt(zone, { protestMinutes: toMidnight + 10, appealMinutes: 60 },
      'Protested Sprite')
    const today = localDate(Date.now(), zone)
    // The claim is issued and submitted before anyone protests.
    const v1 = await call('POST', `/api/attempts/${attemptId}/dossiers`, { cookie: event.cookie.team })
    expect(v1.status, JSON.stringify(v1.body)).toBe(201)
    expect((await call('POST', `/api/dossiers/${v1.body.id}/submission`, { cookie: event.cookie.team })).status).toBe(201)

    const wrongKind = await lodge(event, { attemptId, kind: 'entry', grounds: 'The other entry was not weighed.' })
    expect(wrongKind.body.data.issues[0].path).toBe('kind')
    const short = await lodge(event, { attemptId, kind: 'timing', grounds: 'late' })
    expect(short.body.data.issues).toEqual([{ path: 'grounds', message: 'state the grounds (at least a sentence)' }])
    const lodged = await lodge(event, { attemptId, kind: 'timing', grounds: 'The backup system missed the K-out beam.' })
    expect(lodged.status, JSON.stringify(lodged.body)).toBe(201)
    expect(lodged.body.feeNote).toBe('set by the national authority that issued the permit')
    const list = async () => (await call('GET', `/api/events/${event.eventId}/protests`, { cookie: event.cookie.team })).body
    const [p] = await list()
    // Due the next local day, shortly after midnight, on the event's clock.
    expect(p.deadlineClock).toMatch(new RegExp(`^00:(0[5-9]|1\\d) on ${addDays(today, 1)} \\(${zone.replace('+', '\\+')}\\)$`))
    expect(p.open).toBe(true)

    // While it is open: not ratified, the record book says so, and no new version is issued.
    const ratify = () => call('POST', `/api/dossiers/${v1.body.id}/decision`, {
      cookie: event.cookie.official, body: { decision: 'ratified', reasons: 'in order', ...sign('Test official') },
    })
    const underProtest = await ratify()
    expect(underProtest.status).toBe(409)
    expect(underProtest.body.message).toBe(`This claim is under protest (protest #${p.id}): it is ratified only once `
      + 'each is decided')
    const claim = (await call('GET', '/api/record-book')).body.claims.find((c: { id: number }) => c.id === v1.body.id)
    expect(claim.underProtest).toBe(true)
    const readiness = (await call('GET', `/api/attempts/${attemptId}/readiness`, { cookie: event.cookie.team })).body
    expect(readiness.items.find((i: { key: string }) => i.key === 'protests')).toMatchObject({ met: false })
    expect((await call('POST', `/api/attempts/${attemptId}/dossiers`, { cookie: event.cookie.team })).status).toBe(422)

    // Decided by a steward only, once, with reasons, signed.
    const decide = (id: number, cookie: string, name: string, outcome = 'dismissed') => call('POST', `/api/protests/${id}/decision`, {
      cookie,
      body: {
        heardAt: new Date().toISOString(), present: 'Test Team, the chief timekeeper', outcome, ...sign(name),
        hearing: 'The backup printout shows the K-out time; the team saw it.', reasons: 'Both systems recorded the pass.',
      },
    })
    // An official who is not appointed steward is refused (the event's official is one: appointed to confirm results).
    const plain = await invitedPerson('official', 'first-password-1', 'Plain official', { eventId: event.eventId, organiser: event.cookie.organiser })
    const notSteward = await decide(p.id, plain.cookie, 'Plain official')
    expect(notSteward.status).toBe(403)
    expect(notSteward.body.statusMessage).toBe('Only a steward appointed at this event decides a protest')
    const decided = await decide(p.id, event.cookie.official, 'Test official')
    expect(decided.status, JSON.stringify(decided.body)).toBe(201)
    expect(decided.body).toMatchObject({ outcome: 'dismissed', decisionSignatureId: expect.any(Number) })
    expect((await decide(p.id, event.cookie.official, 'Test official')).status).toBe(409)

    // The dossier sealed before the decision does not carry it: not ratified from it.
    const stale = await ratify()
    expect(stale.status).toBe(409)
    expect(stale.body.message).toContain(`Protest #${p.id} was decided after this dossier was sealed`)

    // A party appeals within the appeal deadline; the appeal is open until its decision is recorded. Three sent at
    // once are one appeal: the others are refused.
    const appeals = await Promise.all([1, 2, 3].map(() => call('POST', `/api/protests/${p.id}/appeals`, {
      cookie: event.cookie.team, body: { grounds: 'The stewards did not hear the backup timekeeper.', ...sign('Test team') },
    })))
    expect(appeals.map(a => a.status).sort()).toEqual([201, 409, 409])
    expect(appeals.find(a => a.status === 409)!.body.statusMessage).toBe('This decision is already under appeal')
    const appeal = appeals.find(a => a.status === 201)!
    expect(appeal.body.appealOf).toBe(p.id)
    expect((await call('POST', `/api/attempts/${attemptId}/dossiers`, { cookie: event.cookie.team })).status).toBe(422)
    expect((await decide(appeal.body.id, event.cookie.organiser, 'Test Organiser')).status).toBe(403)
    expect((await decide(appeal.body.id, event.cookie.official, 'Test official')).status).toBe(201)

    // The stewards' confirmation given before (the test server's clock) no longer counts: a decision came since.
    const unconfirmed = (await call('GET', `/api/attempts/${attemptId}/readiness`, { cookie: event.cookie.team })).body
    expect(unconfirmed.items.find((i: { key: string }) => i.key === 'confirmation')).toMatchObject({ met: false })
    expect((await call('POST', `/api/attempts/${attemptId}/dossiers`, { cookie: event.cookie.team })).status).toBe(422)
    await confirmByStewards(event, attemptId, [[event.cookie.official, 'Test official'], [second.cookie, 'Second official']])

    // A new version carries both decisions, the briefing and start line, and is ratified.
    const v2 = await call('POST', `/api/attempts/${attemptId}/dossiers`, { cookie: event.cookie.team })
    expect(v2.status, JSON.stringify(v2.body)).toBe(201)
    expect((await call('POST', `/api/dossiers/${v2.body.id}/submission`, { cookie: event.cookie.team })).status).toBe(201)
    const ratified = await call('POST', `/api/dossiers/${v2.body.id}/decision`, {
      cookie: event.cookie.official, body: { decision: 'ratified', reasons: 'in order, protest and appeal dismissed', ...sign('Test official') },
    })
    expect(ratified.status, JSON.stringify(ratified.body)).toBe(201)
    const bytes = new Uint8Array(await (await fetch(url(`/api/dossiers/${v2.body.id}/pdf`), { headers: { cookie: event.cookie.team } })).arrayBuffer())
    const text = await pdfText(bytes, 'protested-dossier.pdf')
    expect(text).toContain(`Protest #${p.id} by Test Team (timing), lodged`)
    expect(text).toContain(`Appeal #${appeal.body.id} against the decision on protest #${p.id}`)
    expect(text).toContain('Decision: dismissed, by Test official')
    // The hearing's time on the event's clock with its zone named, UTC beside it.
    expect(text).toMatch(/Heard \d{4}-\d\d-\d\d \d\d:\d\d:\d\d \(Etc\/GMT[-+]?\d*\), \d{4}-\d\d-\d\d \d\d:\d\d:\d\d UTC, present: /)
    expect(text).toContain('Reasons: Both systems recorded the pass.')
    expect(text).toContain('Start line and briefing')
    expect(text).toMatch(/Riders' briefing, held .* UTC: signed on by Test Rider in person on the organiser's device/)
    expect(text).toMatch(/Run #\d+: expected 290 km\/h/)
    expect(text).toContain('Steward: Test official')
    expect((await call('GET', '/api/record-book')).body.claims.find((c: { id: number }) => c.id === v2.body.id).underProtest)
      .toBe(false)
  })
})

describe('a protest too late', () => {
  it('is refused with the deadline as the event\'s clock showed it, and nothing is lodged', async () => {
    // Protests by a clock time of the same day: at 12:xx local, a deadline of 00:01 has passed.
    const zone = zoneAtHour(12)
    const { event, attemptId } = await publishedAttempt(zone, { protestBy: '00:01' }, 'Late Sprite')
    const late = await lodge(event, { attemptId, kind: 'result', grounds: 'The wind was over the limit at the back run.' })
    expect(late.status).toBe(409)
    expect(late.body.message).toMatch(new RegExp(`^Too late: protests against this were due by 00:01 on `
      + `${localDate(Date.now(), zone)} \\(${zone.replace('+', '\\+')}\\)`))
    expect((await call('GET', `/api/events/${event.eventId}/protests`, { cookie: event.cookie.team })).body).toEqual([])
  })

  it('is refused before the result is published', async () => {
    const event = await newTestEvent('intl-motorcycle', 'UTC')
    const entryId = await clearedEntry(event.eventId, 'Unpublished Sprite', {}, {
      team: event.cookie.team, scrutineer: event.cookie.scrutineer, scrutineerPassword: 'first-password-1',
    })
    const run = await call('POST', `/api/events/${event.eventId}/runs`, { cookie: event.cookie.timekeeper, body: { entryId, direction: 'out' } })
    const r = await lodge(event, { attemptId: run.body.attemptId, kind: 'result', grounds: 'The result cannot stand as shown.' })
    expect(r.status).toBe(409)
    expect(r.body.message).toContain('not published yet')
  })
})

describe('an upheld protest\'s consequence', () => {
  it('voids the result it names, on every page and in readiness, until an appeal decides otherwise', async () => {
    const { event, attemptId } = await publishedAttempt('Europe/Paris', { protestMinutes: 60, appealMinutes: 60 }, 'Voided Sprite')
    // A rival team of the event protests the entry; the stewards (the event's official, appointed) uphold it.
    const rival = await invitedPerson('team', 'first-password-1', 'Rival team', { eventId: event.eventId, organiser: event.cookie.organiser, teamName: 'Rival Team' })
    const protest = await call('POST', `/api/events/${event.eventId}/protests`, {
      cookie: rival.cookie, body: { attemptId, kind: 'entry', grounds: 'The machine ran with a fairing not inspected.', ...sign('Rival team') },
    })
    expect(protest.status, JSON.stringify(protest.body)).toBe(201)
    // The team whose attempt it concerns is told, with the grounds (common practice: a party is heard).
    const told = await mailTo(event.email.team, `A protest concerns your attempt #${attemptId}`)
    expect(told.text).toContain('The machine ran with a fairing not inspected.')
    await call('POST', `/api/events/${event.eventId}/appointments`, {
      cookie: event.cookie.organiser, body: { function: 'steward', userId: await idOf(event.cookie.official) },
    })
    const hearing = {
      heardAt: new Date().toISOString(), present: 'Both teams, the chief scrutineer', hearing: 'The fairing was shown.',
      reasons: 'The fairing was fitted after the inspection.', ...sign('Test official'),
    }
    const decide = (id: number, body: Record<string, unknown>) => call('POST', `/api/protests/${id}/decision`, { cookie: event.cookie.official, body: { ...hearing, ...body } })
    // What a decision voids is checked with it: nothing for a dismissal, a run of the attempt for a run.
    const dismissedVoiding = await decide(protest.body.id, { outcome: 'dismissed', voids: 'result' })
    expect(dismissedVoiding.status).toBe(422)
    expect(dismissedVoiding.body.data.issues[0]).toEqual({ path: 'voids', message: 'a dismissed protest makes nothing void' })
    expect((await decide(protest.body.id, { outcome: 'upheld', voids: 'run' })).body.data.issues[0].path).toBe('voidRunId')
    expect((await decide(protest.body.id, { outcome: 'upheld', voids: 'run', voidRunId: 999_999 })).body.data.issues[0])
      .toEqual({ path: 'voidRunId', message: 'is not a run of the attempt protested' })
    const upheld = await decide(protest.body.id, { outcome: 'upheld', voids: 'result' })
    expect(upheld.status, JSON.stringify(upheld.body)).toBe(201)
    expect(upheld.body).toMatchObject({ outcome: 'upheld', voids: 'result', voidRunId: null })
    // Both parties are mailed the decision, its consequence and its reasons.
    for (const to of [event.email.team, rival.email]) {
      const decision = await mailTo(to, `Protest #${protest.body.id} decided: upheld`)
      expect(decision.text).toContain('The attempt\'s result is void.')
      expect(decision.text).toContain('Reasons: The fairing was fitted after the inspection.')
    }

    const live = async () => (await call('GET', `/api/events/${event.eventId}/live`, { cookie: event.cookie.team })).body
      .find((a: { id: number }) => a.id === attemptId)
    const voided = await live()
    expect(voided.valid).toBe(false)
    expect(voided.findings).toContainEqual({ code: 'protest.result-void', severity: 'fail', message: `The stewards upheld protest #${protest.body.id}: the attempt's result is void.` })
    const ready = (await call('GET', `/api/attempts/${attemptId}/readiness`, { cookie: event.cookie.team })).body
    expect(ready.ready).toBe(false)
    expect(ready.items.find((i: { key: string }) => i.key === 'finding-protest.result-void-attempt')).toMatchObject({ met: false, finding: { setAsideable: false } })
    expect((await call('POST', `/api/attempts/${attemptId}/dossiers`, { cookie: event.cookie.team })).status).toBe(422)
    // Nobody sets it aside: only the appeal body's decision changes it.
    const aside = await call('POST', `/api/attempts/${attemptId}/set-asides`, {
      cookie: event.cookie.official, body: { code: 'protest.result-void', runId: null, reason: 'we think it harsh on them', ...sign('Test official') },
    })
    expect(aside.status).toBe(422)
    expect(aside.body.data.issues[0].message).toContain('can never be set aside: the stewards\' decision on a protest stands')
    // Nor do the stewards confirm a void result, whenever they try.
    const confirmVoid = await call('POST', `/api/attempts/${attemptId}/confirmations`, { cookie: event.cookie.official, now: new Date(Date.now() + 86_400_000), body: sign('Test official') })
    expect(confirmVoid.status).toBe(409)
    expect(confirmVoid.body.statusMessage).toBe(`Nothing to confirm: The stewards upheld protest #${protest.body.id}: the attempt's result is void.`)

    // The team appeals; the appeal body upholds the appeal and voids nothing: the result stands again.
    const appeal = await call('POST', `/api/protests/${protest.body.id}/appeals`, {
      cookie: event.cookie.team, body: { grounds: 'The fairing is the one inspected; the photo shows it.', ...sign('Test team') },
    })
    expect(appeal.status, JSON.stringify(appeal.body)).toBe(201)
    const reversed = await decide(appeal.body.id, { outcome: 'upheld', voids: 'nothing', reasons: 'The photograph shows the inspected fairing.' })
    expect(reversed.status, JSON.stringify(reversed.body)).toBe(201)
    const after = await live()
    expect(after.findings.map((f: { code: string }) => f.code)).not.toContain('protest.result-void')
    expect(after.valid).toBe(true)
  })
})

describe('the demo\'s upheld protest', () => {
  it('voids the second team\'s run: its attempt says so, and the decision names the run', async () => {
    const organiser = await login(demoEmail('organiser'))
    const eventId = await demoEventId(organiser)
    const upheld = (await call('GET', `/api/events/${eventId}/protests`, { cookie: organiser })).body
      .find((p: { kind: string, outcome: string }) => p.kind === 'inspection' && p.outcome === 'upheld')
    expect(upheld).toMatchObject({ team: 'Larkspur Works', voids: 'run', voidRunId: expect.any(Number), open: false })
    const wisp = (await call('GET', `/api/events/${eventId}/live`, { cookie: await login('team2@trapline.test') })).body
      .find((a: { id: number }) => a.id === upheld.attemptId)
    expect(wisp.entry.machineName).toBe('Cinder Wisp')
    expect(wisp.findings).toContainEqual({ code: 'protest.run-void', severity: 'fail', message: `The stewards upheld protest #${upheld.id}: run #${upheld.voidRunId} is void: no pair with it is valid.` })
    // The streamliner's result, confirmed by the two stewards once the appeal period of the decision on the other
    // protest had ended (10:00 + 1 h on the run day's clock).
    const streamliner = (await call('GET', `/api/events/${eventId}/protests`, { cookie: organiser })).body
      .find((p: { kind: string }) => p.kind === 'timing')
    const ready = (await call('GET', `/api/attempts/${streamliner.attemptId}/readiness`, { cookie: organiser })).body
    expect(ready.confirmation).toMatchObject({ confirmed: true, quorum: 2, waits: [] })
    expect(ready.confirmation.signers.map((s: { name: string }) => s.name)).toEqual(['Orla Ormsby', 'Stellan Vey'])
    expect(ready.confirmation.afterClock).toMatch(/^11:00 on \d{4}-\d\d-\d\d \(/)
    // And the chief timekeeper's retired laptop: a passkey revoked, kept with its public key, signing nothing.
    const keys = (await call('GET', '/api/me/passkeys', { cookie: await login(demoEmail('timekeeper')) })).body
    expect(keys.find((k: { name: string }) => k.name === 'old timing-hut laptop')).toMatchObject({ revokedAt: expect.any(String) })
  })
})
