import { request } from 'node:http'
import { resolve } from 'node:path'
import { deflateSync } from 'node:zlib'
import { PDFArray, PDFDict, PDFDocument, PDFName, type PDFHexString, type PDFString } from 'pdf-lib'
import pg from 'pg'
import { describe, expect, inject, it } from 'vitest'
import { call, demoEmail, demoEventId, demoMileRecord, invitedPerson, linkToken, login, mailTo, url, useTestServer } from '../support/api'
import { newEntry } from '../support/entries'
import { form, pdf, png } from '../support/files'
import { startApp } from '../support/processes'
import { newTestEvent } from '../support/test-event'

await useTestServer()

describe('bounded input', () => {
  it('refuses a 20 000-digit time by its length, before any arithmetic, naming the field', async () => {
    const huge = `1.${'7'.repeat(20_000)}`
    const r = await call('POST', '/api/calculator', {
      body: { profile: 'intl-motorcycle', distanceM: '1000', runs: [{ direction: 'out', startedAt: '2026-08-14T09:00:00Z', elapsedS: huge }] },
    })
    expect(r.status).toBe(422)
    expect(r.body.data.issues[0]).toMatchObject({ path: 'runs.0.elapsedS', message: 'must be at most 40 characters' })
  })

  it('refuses an exponent that would build a huge number', async () => {
    const r = await call('POST', '/api/calculator', {
      body: { profile: 'intl-motorcycle', distanceM: '1e400', runs: [{ direction: 'out', startedAt: '2026-08-14T09:00:00Z', elapsedS: '9' }] },
    })
    expect(r.status).toBe(422)
    expect(r.body.data.issues[0].path).toBe('distanceM')
  })
})

describe('bounded bodies, ids and text', () => {
  it('answers 413 to a JSON body over 1 MB, declared or not', async () => {
    // The server answers and closes before the client has written it all, so a write error after the answer (EPIPE,
    // a reset) is the expected end of it: the answer's status is what counts. Declared: with its length up front;
    // not declared: in chunks with no length, counted as it arrives.
    const send = (declared: boolean) => new Promise<{ status: number }>((answered, failed) => {
      const chunk = 'x'.repeat(100_000)
      const headers: Record<string, string> = { 'content-type': 'application/json' }
      if (declared) headers['content-length'] = String('{"email":"'.length + 20 * chunk.length)
      const req = request(url('/api/auth/login'), { method: 'POST', headers }, (res) => {
        res.resume()
        answered({ status: res.statusCode! })
      })
      let failure: Error | undefined
      req.on('error', (e) => {
        failure = e
      })
      req.on('close', () => setTimeout(() => failed(failure ?? new Error('closed with no answer')), 2000))
      req.write('{"email":"')
      // A pause after each chunk lets the answer be read before the next chunk meets the closed socket: a reset
      // arriving first would throw the unread answer away (the kernel drops what a reset connection had received).
      const write = (i: number) => {
        if (i > 20 || req.destroyed) return req.end()
        req.write(chunk, () => setTimeout(() => write(i + 1), 50))
      }
      // Declared, the length alone says it is too large: the rest is sent only if no answer came within a second,
      // so that the answer is read before the server closes (writing on meanwhile raced its close).
      if (declared) setTimeout(() => write(1), 1000)
      else write(1)
    })
    // A reset that still beat the answer is tried again, three times at most: the answer, when read, must be 413.
    const answer = async (declared: boolean) => {
      for (let attempt = 1; ; attempt++) {
        try {
          return (await send(declared)).status
        }
        catch (e) {
          if (attempt === 3 || !/EPIPE|ECONNRESET|closed with no answer/.test(String(e))) throw e
        }
      }
    }
    expect(await answer(true)).toBe(413)
    expect(await answer(false)).toBe(413)
  })

  it('refuses a NUL character in any text with 422 naming the field, never a 500', async () => {
    const cookie = await login(demoEmail('organiser'))
    const eventId = await demoEventId(cookie)
    const r = await call('PATCH', `/api/events/${eventId}`, { cookie, body: { venue: 'Tamsel\u0000Flat' } })
    expect(r.status).toBe(422)
    expect(r.body.data.issues[0]).toMatchObject({ path: 'venue', message: 'must not hold a NUL character' })
  })

  it('answers 422 to an id beyond the database\'s integer range, in the path and in the body', async () => {
    const cookie = await login(demoEmail('timekeeper'))
    const eventId = await demoEventId(cookie)
    const inPath = await call('GET', '/api/events/2147483648', { cookie })
    expect(inPath.status).toBe(422)
    expect(inPath.body.data.issues[0].path).toBe('id')
    const inBody = await call('POST', `/api/events/${eventId}/runs`, { cookie, body: { entryId: 99_999_999_999, direction: 'out' } })
    expect(inBody.status).toBe(422)
    expect(inBody.body.data.issues[0].path).toBe('entryId')
  })

  it('refuses a CSV import of more than 10 000 rows with a clear message', async () => {
    const cookie = await login(demoEmail('timekeeper'))
    const eventId = await demoEventId(cookie)
    const csv = ['run,trap,time', ...Array.from({ length: 10_001 }, () => '1,K-in,10:00:00.000')].join('\n')
    const r = await call('POST', `/api/events/${eventId}/imports`, { cookie, body: { csv, columns: { run: 'run', trap: 'trap', time: 'time' } } })
    expect(r.status).toBe(422)
    expect(r.body.data.issues[0]).toMatchObject({ path: 'csv' })
    expect(r.body.data.issues[0].message).toContain('at most 10000')
  })
})

describe('sessions that end', () => {
  const me = (cookie: string) => call('GET', '/api/me', { cookie })

  it('a new password ends every other session of the person; this one goes on', async () => {
    const person = await invitedPerson('official', 'first-password-1')
    const other = await login(person.email, 'first-password-1')
    expect((await me(other)).status).toBe(200)
    const changed = await fetch(url('/api/auth/password'), {
      method: 'POST',
      headers: { 'content-type': 'application/json', 'cookie': person.cookie },
      body: JSON.stringify({ currentPassword: 'first-password-1', newPassword: 'second-password-2' }),
    })
    expect(changed.status).toBe(200)
    const renewed = changed.headers.getSetCookie().map(c => c.split(';')[0]).join('; ')
    expect((await me(renewed)).status).toBe(200)
    expect((await me(other)).status).toBe(401)
    expect((await me(person.cookie)).status).toBe(401) // the cookie before the change was replaced
  })

  it('a reset through a link ends every session and spends the person\'s other open links', async () => {
    const person = await invitedPerson('official', 'first-password-1')
    for (let i = 0; i < 2; i++) expect((await call('POST', '/api/auth/forgot', { body: { email: person.email } })).status).toBe(202)
    const first = linkToken((await mailTo(person.email, 'new password')).text)
    // Both mails went out; the other one is the second link.
    await expect.poll(async () => (await (await fetch(`${inject('inboxUrl')}/api/messages`)).json() as { to: string[], subject: string }[])
      .filter(m => m.to.includes(person.email) && m.subject.includes('new password')).length).toBe(2)
    const links = (await (await fetch(`${inject('inboxUrl')}/api/messages`)).json() as { to: string[], text: string }[])
      .filter(m => m.to.includes(person.email) && m.text.includes('set-password')).map(m => linkToken(m.text))
    const second = links.find(l => l !== first && l !== person.token)!
    expect(second).toBeTruthy()
    expect((await call('POST', '/api/auth/token', { body: { token: first, password: 'third-password-3' } })).status).toBe(200)
    expect((await me(person.cookie)).status).toBe(401)
    expect((await call('POST', '/api/auth/token', { body: { token: second, password: 'fourth-password-4' } })).status).toBe(410)
  })

  it('signing out everywhere ends the sessions on other devices', async () => {
    const person = await invitedPerson('official', 'first-password-1')
    const other = await login(person.email, 'first-password-1')
    expect((await call('POST', '/api/auth/logout', { cookie: person.cookie, body: { everywhere: true } })).status).toBe(204)
    expect((await me(other)).status).toBe(401)
    const plain = await login(person.email, 'first-password-1')
    const third = await login(person.email, 'first-password-1')
    expect((await call('POST', '/api/auth/logout', { cookie: plain })).status).toBe(204)
    expect((await me(third)).status).toBe(200) // an ordinary sign-out ends this session only
  })

  it('reads administrator rights from the database on every request, not from the cookie', async () => {
    const person = await invitedPerson('official', 'first-password-1')
    const db = new pg.Client({ connectionString: inject('databaseUrl') })
    await db.connect()
    try {
      expect((await call('GET', '/api/admin/outbox', { cookie: person.cookie })).status).toBe(403)
      await db.query('update users set is_admin = true where email = $1', [person.email])
      expect((await call('GET', '/api/admin/outbox', { cookie: person.cookie })).status).toBe(200)
      await db.query('update users set is_admin = false where email = $1', [person.email])
      expect((await call('GET', '/api/admin/outbox', { cookie: person.cookie })).status).toBe(403)
    }
    finally {
      await db.end()
    }
  })
})

describe('answers that tell nothing', () => {
  it('a password reset answers the same for an address with an account and one without', async () => {
    const known = await call('POST', '/api/auth/forgot', { body: { email: demoEmail('official') } })
    const unknown = await call('POST', '/api/auth/forgot', { body: { email: `nobody-${Date.now()}@example.test` } })
    expect([known.status, unknown.status]).toEqual([202, 202])
    expect(known.body).toEqual(unknown.body)
  })

  it('an invitation answers the same whether or not the address already has an account', async () => {
    const cookie = await login(demoEmail('organiser'))
    const eventId = await demoEventId(cookie)
    const fresh = await call('POST', `/api/events/${eventId}/people`, { cookie, body: { email: `fresh-${Date.now()}@example.test`, name: 'Fresh Person', role: 'official' } })
    // A person of the test's own who already has an account, given a second role.
    const person = await invitedPerson('official')
    const existing = await call('POST', `/api/events/${eventId}/people`, { cookie, body: { email: person.email, name: 'Someone', role: 'timekeeper' } })
    expect([fresh.status, existing.status]).toEqual([201, 201])
    expect(Object.keys(fresh.body).sort()).toEqual(Object.keys(existing.body).sort())
  })
})

describe('evidence that cannot be planted', () => {
  const upload = (cookie: string, eventId: number, body: FormData) =>
    fetch(url(`/api/events/${eventId}/evidence`), { method: 'POST', headers: { cookie }, body })
      .then(async r => ({ status: r.status, body: await r.json() as any }))
  const setupOf = async (cookie: string, eventId: number) => (await call('GET', `/api/events/${eventId}/setup`, { cookie })).body

  it('a course certificate only by the organiser, a calibration by the organiser or a timekeeper, each on its target', async () => {
    const timekeeper = await login(demoEmail('timekeeper'))
    const eventId = await demoEventId(timekeeper)
    const setup = await setupOf(timekeeper, eventId)
    const courseId = setup.courses[0].id
    const systemId = setup.systems[0].id
    expect((await upload(timekeeper, eventId, form({ kind: 'survey-certificate', courseId }, { name: 's.pdf', bytes: pdf('planted') }))).status).toBe(403)
    const official = await login(demoEmail('official'))
    expect((await upload(official, eventId, form({ kind: 'calibration-certificate', timingSystemId: systemId }, { name: 'c.pdf', bytes: pdf('planted') }))).status).toBe(403)
    const bare = await upload(timekeeper, eventId, form({ kind: 'calibration-certificate' }, { name: 'c.pdf', bytes: pdf('no target') }))
    expect(bare.status).toBe(422)
    expect(bare.body.data.issues[0].path).toBe('timingSystemId')
    expect((await upload(timekeeper, eventId, form({ kind: 'calibration-certificate', timingSystemId: systemId }, { name: 'c.pdf', bytes: pdf(`calibration ${Date.now()}`) }))).status).toBe(201)
  })

  it('refuses a field sent after the file, storing nothing', async () => {
    const organiser = await login(demoEmail('organiser'))
    const eventId = await demoEventId(organiser)
    const setup = await setupOf(organiser, eventId)
    const body = form({ kind: 'other-document' }, { name: 'late.pdf', bytes: pdf(`late ${Date.now()}`) })
    body.append('courseId', String(setup.courses[0].id))
    const r = await upload(organiser, eventId, body)
    expect(r.status).toBe(422)
    expect(r.body.data.issues[0]).toMatchObject({ path: 'courseId', message: expect.stringContaining('after the file') })
  })

  it('a person who is both team and official attaches only to their own team\'s records', async () => {
    const organiser = await login(demoEmail('organiser'))
    const eventId = await demoEventId(organiser)
    const person = await invitedPerson('team', 'first-password-1', 'Two Hats', { teamName: 'Cinder Hollow Engineering' })
    expect((await call('POST', `/api/events/${eventId}/people`, { cookie: organiser, body: { email: person.email, name: 'Two Hats', role: 'official' } })).status).toBe(201)
    const setup = await setupOf(organiser, eventId)
    const rival = setup.entries.find((e: any) => e.machineName === 'Larkspur Fennwick streamliner').id
    const r = await upload(person.cookie, eventId, form({ kind: 'photo', entryId: rival }, { name: 'p.png', bytes: png }))
    expect(r.status).toBe(404)
  })

  it('stops a team at its storage quota with a clear message, keeping nothing of the refused file', async () => {
    const organiser = await login(demoEmail('organiser'))
    const eventId = await demoEventId(organiser)
    const team = await invitedPerson('team', 'first-password-1', 'Quota Keeper', { teamName: `Quota Team ${Date.now()}` })
    const entryId = await newEntry(eventId, 'Quota Runner', {}, { team: team.cookie })
    // The test server's quota is 3 MB per team; 2 MB photos: the first fits, the second does not.
    const photo = (n: number) => Buffer.concat([png, Buffer.alloc(2 * 1024 * 1024, n)])
    expect((await upload(team.cookie, eventId, form({ kind: 'photo', entryId }, { name: 'a.png', bytes: photo(1) }))).status).toBe(201)
    const over = await upload(team.cookie, eventId, form({ kind: 'photo', entryId }, { name: 'b.png', bytes: photo(2) }))
    expect(over.status).toBe(413)
    expect(over.body.data.issues[0].message).toContain('the room left in the team\'s storage')
  })
})

describe('a safe start', () => {
  it('sends security headers with every page and answer', async () => {
    for (const path of ['/login', '/api/health']) {
      const r = await fetch(url(path))
      const csp = r.headers.get('content-security-policy') ?? ''
      expect(csp).toContain('default-src \'self\'')
      expect(csp).toContain('frame-ancestors \'self\'')
      expect(csp).toContain('object-src \'none\'')
      expect(r.headers.get('x-content-type-options')).toBe('nosniff')
      expect(r.headers.get('referrer-policy')).toBe('strict-origin-when-cross-origin')
    }
  })

  it('a start without the demo seed refuses to run while a demo account opens with the demo password', async () => {
    const env = JSON.parse(inject('serverEnv'))
    const start = startApp(env.output, {
      NUXT_DATABASE_URL: env.databaseUrl,
      NUXT_DATA_DIR: resolve(env.runDir, 'production-start'),
      NUXT_SEAL_DIR: resolve(env.dataDir, 'seal'), // the seal's key set is shared by every server
      NUXT_MAIL_PORT: String(env.smtpPort),
      NUXT_SEED_DEMO: 'false',
    })
    const outcome = await start.then(
      async (server) => {
        await expect.poll(() => server.child.exitCode, { timeout: 15_000 }).toBe(1)
        return server.log()
      },
      (e: Error) => e.message,
    )
    expect(outcome).toContain('refusing to start')
  })
})

describe('rate limits that count every guess', () => {
  it('counts a burst of parallel wrong passwords as that many, and a forged forwarded address changes nothing', async () => {
    const person = await invitedPerson('official', 'first-password-1')
    const guess = (i: number, headers: Record<string, string> = {}) => fetch(url('/api/auth/login'), {
      method: 'POST',
      headers: { 'content-type': 'application/json', ...headers },
      body: JSON.stringify({ email: person.email, password: `wrong-${i}` }),
    }).then(r => r.status)
    // 20 at once from one client: the limit is 10 per address and client (counted atomically, before the
    // password is checked), so exactly 10 are judged and 10 refused.
    const statuses = await Promise.all(Array.from({ length: 20 }, (_, i) => guess(i)))
    expect(statuses.filter(s => s === 401).length).toBe(10)
    expect(statuses.filter(s => s === 429).length).toBe(10)
    // A made-up X-Forwarded-For is not trusted (no proxy declared): still the same client.
    expect(await guess(99, { 'x-forwarded-for': '203.0.113.7' })).toBe(429)
    const right = await call('POST', '/api/auth/login', { body: { email: person.email, password: 'first-password-1' } })
    expect(right.status).toBe(429)
  })

  // The order (the link checked before the password is hashed) is not observable from outside; this checks
  // that a link that does not exist is refused as such.
  it('answers 404 to a link that does not exist', async () => {
    const bad = await call('POST', '/api/auth/token', { body: { token: 'x'.repeat(43), password: 'whatever-password-1' } })
    expect(bad.status).toBe(404)
  })
})

describe('a bounded verification page', () => {
  const verify = async (bytes: Uint8Array) => {
    const body = new FormData()
    body.append('file', new Blob([bytes], { type: 'application/pdf' }), 'dossier.pdf')
    const r = await fetch(url('/api/dossiers/verify'), { method: 'POST', body })
    return { status: r.status, body: await r.json() as any }
  }
  const sealedPdf = async () => new Uint8Array(await (await fetch((await demoMileRecord()).dossierUrl)).arrayBuffer())

  it('refuses a file over 50 MB, saying a dossier is a few MB', async () => {
    const r = await verify(Buffer.concat([Buffer.from('%PDF-1.7\n'), Buffer.alloc(51 * 1024 * 1024, 32)]))
    expect(r.status).toBe(413)
    expect(r.body.data.issues[0].message).toContain('a few MB')
  })

  it('refuses an attachment that inflates beyond what a dossier holds, without unpacking it', async () => {
    // 100 MB of zeros deflate to about 100 kB (zlib, RFC 1950/1951): put in place of the manifest.
    const doc = await PDFDocument.load(await sealedPdf(), { updateMetadata: false })
    const names = doc.catalog.lookup(PDFName.of('Names'), PDFDict).lookup(PDFName.of('EmbeddedFiles'), PDFDict).lookup(PDFName.of('Names'), PDFArray)
    const bomb = doc.context.stream(deflateSync(Buffer.alloc(100 * 1024 * 1024)), { Type: 'EmbeddedFile', Filter: 'FlateDecode' })
    for (let i = 1; i < names.size(); i += 2) names.lookup(i, PDFDict).lookup(PDFName.of('EF'), PDFDict).set(PDFName.of('F'), doc.context.register(bomb))
    const r = await verify(await doc.save({ useObjectStreams: false }))
    expect(r.status).toBe(422)
    expect(r.body.message).toContain('unpacks to more than a dossier ever holds')
  })

  it('does not read a manifest whose seal does not hold', async () => {
    const doc = await PDFDocument.load(await sealedPdf(), { updateMetadata: false })
    const names = doc.catalog.lookup(PDFName.of('Names'), PDFDict).lookup(PDFName.of('EmbeddedFiles'), PDFDict).lookup(PDFName.of('Names'), PDFArray)
    for (let i = 0; i < names.size(); i += 2) {
      if ((names.lookup(i) as PDFString | PDFHexString).decodeText() !== 'manifest.json') continue
      const forged = JSON.stringify({ evidence: Array.from({ length: 50_000 }, (_, n) => ({ name: `f${n}`, sha256: '0'.repeat(64) })) })
      names.lookup(i + 1, PDFDict).lookup(PDFName.of('EF'), PDFDict).set(PDFName.of('F'), doc.context.register(doc.context.flateStream(forged, { Type: 'EmbeddedFile' })))
    }
    const r = await verify(await doc.save({ useObjectStreams: false }))
    expect(r.body.sealValid).toBe(false)
    expect(r.body.keyFingerprint).toBeNull()
    // The forged manifest named 50 000 files: none was looked for, as the seal failed first.
    expect(r.body.items.length).toBeLessThan(50)
    expect(r.body.items.find((i: any) => i.name === 'manifest.json').ok).toBe(false)
  })
})

describe('a least-privilege database', () => {
  it('the app\'s role owns nothing and can neither disable a trigger, truncate nor change the schema', async () => {
    const app = new pg.Client({ connectionString: JSON.parse(inject('serverEnv')).databaseUrl })
    await app.connect()
    try {
      expect((await app.query('select current_user')).rows[0].current_user).toBe('trapline_app')
      const owned = await app.query('select count(*)::int as n from pg_tables where tableowner = current_user')
      expect(owned.rows[0].n).toBe(0)
      await expect(app.query('alter table readings disable trigger readings_append_only')).rejects.toThrow(/owner|permission/)
      await expect(app.query('truncate readings')).rejects.toThrow(/permission denied/)
      await expect(app.query('create table planted (x int)')).rejects.toThrow(/permission denied/)
      await expect(app.query('drop table readings')).rejects.toThrow(/owner|permission/)
      await expect(app.query('update readings set ticks = ticks + 1')).rejects.toThrow(/append-only/)
    }
    finally {
      await app.end()
    }
  })

  it('even the owner cannot truncate a record that is never deleted', async () => {
    const owner = new pg.Client({ connectionString: inject('databaseUrl') })
    await owner.connect()
    try {
      await owner.query('begin')
      await expect(owner.query('truncate signatures cascade')).rejects.toThrow(/never deleted/)
      await owner.query('rollback')
    }
    finally {
      await owner.end()
    }
  })

  it('asks for a password even on the loopback interface', async () => {
    const url = new URL(inject('databaseUrl'))
    url.password = ''
    const bare = new pg.Client({ connectionString: url.toString(), password: '' })
    await expect(bare.connect()).rejects.toThrow(/password/)
    await bare.end().catch(() => {})
  })
})

describe('removing a role', () => {
  it('the organiser removes a person\'s role, which ends what it gave at once; never the last organiser', async () => {
    const organiser = await login(demoEmail('organiser'))
    const eventId = await demoEventId(organiser)
    const person = await invitedPerson('official')
    expect((await call('GET', `/api/events/${eventId}/statements`, { cookie: person.cookie })).status).toBe(200)
    const people = (await call('GET', `/api/events/${eventId}/people`, { cookie: organiser })).body as any[]
    const mine = people.find(p => p.email === person.email)
    expect((await call('DELETE', `/api/events/${eventId}/people/${mine.membershipId}`, { cookie: person.cookie })).status).toBe(403)
    expect((await call('DELETE', `/api/events/${eventId}/people/${mine.membershipId}`, { cookie: organiser })).status).toBe(204)
    expect((await call('GET', `/api/events/${eventId}/statements`, { cookie: person.cookie })).status).toBe(404)
  })

  it('never removes the last organiser of an event', async () => {
    // An event of the test's own, with one organiser.
    const own = await newTestEvent('intl-motorcycle', 'UTC')
    const people = (await call('GET', `/api/events/${own.eventId}/people`, { cookie: own.cookie.organiser })).body as any[]
    const organisers = people.filter(p => p.role === 'organiser')
    expect(organisers).toHaveLength(1)
    const last = await call('DELETE', `/api/events/${own.eventId}/people/${organisers[0].membershipId}`, { cookie: own.cookie.organiser })
    expect(last.status).toBe(409)
    expect(last.body.statusMessage).toContain('needs an organiser')
  })
})
