import pg from 'pg'
import { afterAll, describe, expect, inject, it } from 'vitest'
import { call, DEMO_PASSWORD, demoEmail, demoEventId, invitedPerson, linkToken, login, mailTo, unique, url, useTestServer } from '../support/api'

await useTestServer()

const db = new pg.Client({ connectionString: inject('databaseUrl') })
await db.connect()
afterAll(() => db.end())

describe('sign-in', () => {
  it('signs in with a sealed cookie: HttpOnly, SameSite=Lax', async () => {
    const r = await call('POST', '/api/auth/login', { body: { email: demoEmail('timekeeper'), password: DEMO_PASSWORD } })
    expect(r.status).toBe(200)
    expect(r.body.user.email).toBe(demoEmail('timekeeper'))
    const cookie = r.headers.getSetCookie().join('\n')
    expect(cookie).toMatch(/HttpOnly/i)
    expect(cookie).toMatch(/SameSite=Lax/i)
    expect(cookie).not.toContain(DEMO_PASSWORD)
    // Served over plain http here, so not Secure (a browser on the timing-hut network must keep it).
    expect(cookie).not.toMatch(/;\s*Secure/i)
  })

  it('marks the cookie Secure when the request came over https through a proxy', async () => {
    const r = await fetch(url('/api/auth/login'), {
      method: 'POST',
      headers: { 'content-type': 'application/json', 'x-forwarded-proto': 'https' },
      body: JSON.stringify({ email: demoEmail('timekeeper'), password: DEMO_PASSWORD }),
    })
    expect(r.status).toBe(200)
    expect(r.headers.getSetCookie().join('\n')).toMatch(/;\s*Secure/i)
  })

  it('accepts the address in any case', async () => {
    const r = await call('POST', '/api/auth/login', { body: { email: demoEmail('official').toUpperCase(), password: DEMO_PASSWORD } })
    expect(r.status).toBe(200)
  })

  it('gives the same message for a wrong password and an unknown address', async () => {
    const wrong = await call('POST', '/api/auth/login', { body: { email: demoEmail('official'), password: 'not-the-password' } })
    const unknown = await call('POST', '/api/auth/login', { body: { email: unique('nobody'), password: 'not-the-password' } })
    expect(wrong.status).toBe(401)
    expect(unknown.status).toBe(401)
    expect(wrong.body.statusMessage).toBe(unknown.body.statusMessage)
    expect(wrong.body.statusMessage).toBe('Wrong e-mail address or password')
  })

  it('names the field of an invalid body with 422', async () => {
    const r = await call('POST', '/api/auth/login', { body: { email: 'not an address', password: '' } })
    expect(r.status).toBe(422)
    expect(r.body.data.issues.map((i: { path: string }) => i.path).sort()).toEqual(['email', 'password'])
  })

  it('answers 400, not 500, to a body that is not JSON', async () => {
    const r = await call('POST', '/api/auth/login', { raw: '{"email": ' })
    expect(r.status).toBe(400)
  })

  it('refuses with 429 after 10 failed attempts in 15 minutes, even with the right password', async () => {
    const person = await invitedPerson()
    for (let i = 0; i < 10; i++) {
      const r = await call('POST', '/api/auth/login', { body: { email: person.email, password: `wrong-${i}` } })
      expect(r.status).toBe(401)
    }
    const locked = await call('POST', '/api/auth/login', { body: { email: person.email, password: person.password } })
    expect(locked.status).toBe(429)
    expect(locked.body.data.retryAfterS).toBeGreaterThan(0)
    // Counted in PostgreSQL: ageing the count past its window (and block) lifts the limit.
    await db.query(`update rate_limits set expire = 1 where key like 'signInByAddressAndClient:%'`)
    const again = await call('POST', '/api/auth/login', { body: { email: person.email, password: person.password } })
    expect(again.status).toBe(200)
  })

  it('signs out: the session it was sent is cleared, and the browser holding the answer is signed out', async () => {
    const session = await login(demoEmail('official'))
    expect((await call('GET', '/api/me', { cookie: session })).status).toBe(200)
    const r = await call('POST', '/api/auth/logout', { cookie: session })
    expect(r.status).toBe(204)
    const cleared = r.headers.getSetCookie().find(c => c.startsWith('nuxt-session='))!
    expect(cleared).toMatch(/^nuxt-session=;|Max-Age=0|Expires=Thu, 01 Jan 1970/i)
    // What a browser keeps after that answer: the cookie's new, empty value.
    expect((await call('GET', '/api/me', { cookie: cleared.split(';')[0] })).status).toBe(401)
    // And the cookie as it was, kept by someone else: the session ended on the server, so it is refused too.
    expect((await call('GET', '/api/me', { cookie: session })).status).toBe(401)
  })

  it('signing out one session leaves the person\'s other sessions signed in', async () => {
    const phone = await login(demoEmail('official'))
    const desk = await login(demoEmail('official'))
    expect((await call('POST', '/api/auth/logout', { cookie: phone })).status).toBe(204)
    expect((await call('GET', '/api/me', { cookie: phone })).status).toBe(401)
    expect((await call('GET', '/api/me', { cookie: desk })).status).toBe(200)
  })
})

describe('invitations and passwords', () => {
  it('invites a person by e-mail, who sets a password, signs in and sees the role at home', async () => {
    const person = await invitedPerson('scrutineer')
    const cookie = await login(person.email, person.password)
    const home = await call('GET', '/api/home', { cookie })
    expect(home.status).toBe(200)
    expect(home.body.homes.map((h: { role: string }) => h.role)).toEqual(['scrutineer'])
  })

  it('a link works once only', async () => {
    const person = await invitedPerson()
    const again = await call('POST', '/api/auth/token', { body: { token: person.token, password: 'another-password-2' } })
    expect(again.status).toBe(410)
  })

  it('an invitation for a role someone already holds answers 409', async () => {
    const organiser = await login(demoEmail('organiser'))
    const eventId = await demoEventId(organiser)
    const r = await call('POST', `/api/events/${eventId}/people`, { cookie: organiser, body: { email: demoEmail('timekeeper'), name: 'Tobias Tick', role: 'timekeeper' } })
    expect(r.status).toBe(409)
  })

  it('a team invitation must name the team', async () => {
    const organiser = await login(demoEmail('organiser'))
    const eventId = await demoEventId(organiser)
    const r = await call('POST', `/api/events/${eventId}/people`, { cookie: organiser, body: { email: unique('team'), name: 'New Entrant', role: 'team' } })
    expect(r.status).toBe(422)
    expect(r.body.data.issues[0].path).toBe('teamName')
  })

  it('resets a password by e-mail; the link expires', async () => {
    const person = await invitedPerson()
    const forgot = await call('POST', '/api/auth/forgot', { body: { email: person.email } })
    expect(forgot.status).toBe(202)
    const unknown = await call('POST', '/api/auth/forgot', { body: { email: unique('nobody') } })
    expect(unknown.status).toBe(202)
    expect(unknown.body.message).toBe(forgot.body.message)

    const token = linkToken((await mailTo(person.email, 'new password')).text)
    const info = await call('GET', `/api/auth/token?token=${token}`)
    expect(info.body).toMatchObject({ purpose: 'reset', email: person.email })

    await db.query(`update auth_tokens set expires_at = now() - interval '1 minute' where purpose = 'reset' and user_id = (select id from users where email = $1)`, [person.email])
    const expired = await call('POST', '/api/auth/token', { body: { token, password: 'reset-password-3' } })
    expect(expired.status).toBe(410)

    await call('POST', '/api/auth/forgot', { body: { email: person.email } })
    // The answer does not wait for the mail server: the mail arrives through the outbox just after.
    const freshMail = async () => ((await (await fetch(`${inject('inboxUrl')}/api/messages`)).json()) as { to: string, subject: string, text: string }[])
      .find(m => m.to.includes(person.email) && m.subject.includes('new password') && linkToken(m.text) !== token)
    await expect.poll(freshMail, { timeout: 10_000 }).toBeTruthy()
    const fresh = linkToken((await freshMail())!.text)
    const ok = await call('POST', '/api/auth/token', { body: { token: fresh, password: 'reset-password-3' } })
    expect(ok.status).toBe(200)
    expect((await call('POST', '/api/auth/login', { body: { email: person.email, password: person.password } })).status).toBe(401)
    expect((await call('POST', '/api/auth/login', { body: { email: person.email, password: 'reset-password-3' } })).status).toBe(200)
  })

  it('changes the password only with the current one', async () => {
    const person = await invitedPerson()
    const cookie = await login(person.email, person.password)
    const bad = await call('POST', '/api/auth/password', { cookie, body: { currentPassword: 'wrong-password', newPassword: 'changed-password-4' } })
    expect(bad.status).toBe(422)
    expect(bad.body.data.issues[0].path).toBe('currentPassword')
    const short = await call('POST', '/api/auth/password', { cookie, body: { currentPassword: person.password, newPassword: 'short' } })
    expect(short.status).toBe(422)
    expect(short.body.data.issues[0].path).toBe('newPassword')
    // A reset link asked for before the change (by anyone who could read the mail) is spent by it.
    expect((await call('POST', '/api/auth/forgot', { body: { email: person.email } })).status).toBe(202)
    const before = linkToken((await mailTo(person.email, 'new password')).text)
    const ok = await call('POST', '/api/auth/password', { cookie, body: { currentPassword: person.password, newPassword: 'changed-password-4' } })
    expect(ok.status).toBe(200)
    expect((await call('POST', '/api/auth/login', { body: { email: person.email, password: 'changed-password-4' } })).status).toBe(200)
    const late = await call('POST', '/api/auth/token', { body: { token: before, password: 'taken-over-password-5' } })
    expect(late.status).toBe(410)
    expect(late.body.statusMessage).toBe('This link has already been used')
    expect((await call('POST', '/api/auth/login', { body: { email: person.email, password: 'taken-over-password-5' } })).status).toBe(401)
  })
})

describe('events and roles', () => {
  it('one person holds different roles at different events', async () => {
    const admin = await login(demoEmail('admin'))
    const created = await call('POST', '/api/events', {
      cookie: admin,
      body: { name: 'Roles test event', venue: 'Test course', startsOn: '2026-10-01', endsOn: '2026-10-01', timeZone: 'UTC', profileId: 'club-same-direction', organiserEmail: demoEmail('timekeeper'), organiserName: 'Tobias Tick' },
    })
    expect(created.status).toBe(201)
    expect(created.body.profile.id).toBe('club-same-direction')
    expect(created.body.profile.version).toBe(1)
    const tk = await login(demoEmail('timekeeper'))
    const me = await call('GET', '/api/me', { cookie: tk })
    const roles = me.body.memberships.map((m: { eventName: string, role: string }) => `${m.eventName}: ${m.role}`)
    expect(roles).toContain('Roles test event: organiser')
    expect(roles).toContain('Tamsel Flat Electric Record Days: timekeeper')
    // Organiser there, so the people of that event are open; at the demo event only the timekeeper.
    expect((await call('GET', `/api/events/${created.body.id}/people`, { cookie: tk })).status).toBe(200)
    const demoId = me.body.memberships.find((m: { role: string }) => m.role === 'timekeeper').eventId
    expect((await call('GET', `/api/events/${demoId}/people`, { cookie: tk })).status).toBe(403)
  })

  it('an event that does not exist answers 404, an id that is not a number 422', async () => {
    const admin = await login(demoEmail('admin'))
    expect((await call('GET', '/api/events/999999', { cookie: admin })).status).toBe(404)
    const bad = await call('GET', '/api/events/abc', { cookie: admin })
    expect(bad.status).toBe(422)
    expect(bad.body.data.issues[0].path).toBe('id')
  })

  it('hides other teams\' rider licences from a team', async () => {
    const team = await login(demoEmail('team'))
    const me = await call('GET', '/api/me', { cookie: team })
    const overview = await call('GET', `/api/events/${me.body.memberships[0].eventId}`, { cookie: team })
    const mine = overview.body.teams.find((t: { id: number }) => t.id === me.body.memberships[0].teamId)
    const other = overview.body.teams.find((t: { id: number }) => t.id !== me.body.memberships[0].teamId)
    // The demo seeds the first team's rider with licence DEMO-L-0417.
    expect(mine.riders.map((r: { licenceNo: string }) => r.licenceNo)).toContain('DEMO-L-0417')
    expect(other.riders.map((r: { licenceNo: string | null }) => r.licenceNo)).toEqual(other.riders.map(() => null))
  })

  it('refuses an event whose last day is before its first, naming the field', async () => {
    const admin = await login(demoEmail('admin'))
    const r = await call('POST', '/api/events', {
      cookie: admin,
      body: { name: 'Backwards', venue: 'Test', startsOn: '2026-10-02', endsOn: '2026-10-01', timeZone: 'Not/AZone', profileId: 'intl-motorcycle', organiserEmail: unique('o'), organiserName: 'O O' },
    })
    expect(r.status).toBe(422)
    expect(r.body.data.issues.map((i: { path: string }) => i.path).sort()).toEqual(['endsOn', 'timeZone'])
  })
})
