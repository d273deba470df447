import { existsSync, readdirSync } from 'node:fs'
import { request } from 'node:http'
import { join } from 'node:path'
import pg from 'pg'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { startApp } from '../support/processes'
import { call, demoEmail, demoEventId, login, url, useTestServer } from '../support/api'
import { form, pdf, png, sha256 } from '../support/files'

await useTestServer()
const db = new pg.Client({ connectionString: inject('databaseUrl') })
await db.connect()
afterAll(() => db.end())

const cookie = {} as Record<'admin' | 'organiser' | 'timekeeper' | 'team' | 'team2', string>
let eventId = 0
let courseId = 0
let runId = 0
// Each app server stages its uploads in a folder of its own (NUXT_SERVER_ID; the test server is "main").
const tmpDir = (server = 'main') => join(inject('dataDir'), 'uploads-tmp', server)
const tmpFiles = (server = 'main') => (existsSync(tmpDir(server)) ? readdirSync(tmpDir(server)) : [])
const storedFiles = () => readdirSync(join(inject('dataDir'), 'evidence'), { recursive: true }).filter(f => /[0-9a-f]{64}$/.test(String(f)))
const rows = async () => Number((await db.query('select count(*) from evidence')).rows[0].count)

async function upload(who: keyof typeof cookie, body: FormData, event = eventId) {
  const r = await fetch(url(`/api/events/${event}/evidence`), { method: 'POST', headers: { cookie: cookie[who] }, body })
  return { status: r.status, body: await r.json() as any }
}

beforeAll(async () => {
  for (const who of ['admin', 'organiser', 'timekeeper'] as const) cookie[who] = await login(demoEmail(who))
  cookie.team = await login('team@trapline.test')
  cookie.team2 = await login('team2@trapline.test')
  eventId = await demoEventId(cookie.organiser)
  const setup = (await call('GET', `/api/events/${eventId}/setup`, { cookie: cookie.organiser })).body
  courseId = setup.courses.find((c: { name: string }) => c.name === 'North course').id
  const live = (await call('GET', `/api/events/${eventId}/live`, { cookie: cookie.team })).body
  runId = live.find((a: any) => a.entry.teamName === 'Larkspur Works').runs[0].id
})

describe('uploads', () => {
  it('stores a survey certificate by content hash, computed while streaming, and keeps one copy of equal content', async () => {
    const bytes = pdf('north course survey')
    const first = await upload('organiser', form({ kind: 'survey-certificate', courseId }, { name: 'survey north course.pdf', bytes }))
    expect(first.status).toBe(201)
    expect(first.body).toMatchObject({ kind: 'survey-certificate', mediaType: 'application/pdf', size: bytes.length, sha256: sha256(bytes), courseId, storedBefore: false })
    const again = await upload('organiser', form({ kind: 'other-document' }, { name: 'copy.pdf', bytes }))
    expect(again.status).toBe(201)
    expect(again.body.storedBefore).toBe(true)
    expect(storedFiles().filter(f => String(f).endsWith(sha256(bytes)))).toHaveLength(1)
    // The download is the same bytes.
    const content = await fetch(url(`/api/evidence/${first.body.id}/content?download=1`), { headers: { cookie: cookie.organiser } })
    expect(content.headers.get('content-type')).toBe('application/pdf')
    expect(content.headers.get('content-disposition')).toBe('attachment; filename*=UTF-8\'\'survey%20north%20course.pdf')
    expect(sha256(new Uint8Array(await content.arrayBuffer()))).toBe(sha256(bytes))
    await expect.poll(() => tmpFiles()).toEqual([]) // the staging file goes once the refusal is sent
  })

  it.each([
    ['a ".pdf" that is not a PDF', { kind: 'survey-certificate', courseId: 0 }, { name: 'survey.pdf', bytes: png }, 422, 'file', /ends in .pdf but the content is image\/png/],
    ['an empty file', { kind: 'other-document' }, { name: 'empty.pdf', bytes: new Uint8Array(0) }, 422, 'file', /empty/],
    ['a file over the kind\'s limit', { kind: 'other-document' }, { name: 'big.pdf', bytes: Buffer.concat([pdf(), Buffer.alloc(150 * 1024, 32)]) }, 413, 'file', /over the limit/],
    ['a name with a path', { kind: 'other-document' }, { name: '../../etc/passwd.pdf', bytes: pdf() }, 422, 'file', /must not contain/],
    ['a name with a control character', { kind: 'other-document' }, { name: 'bell\u0007.pdf', bytes: pdf() }, 422, 'file', /control characters/],
    ['an unknown kind', { kind: 'poster' }, { name: 'a.pdf', bytes: pdf() }, 422, 'kind', /must be one of/],
  ])('refuses %s with a clear error, leaving no file and no row', async (_what, fields, file, status, path, message) => {
    const f = { ...fields, ...(fields.courseId === 0 ? { courseId } : {}) } as Record<string, string | number>
    const before = { rows: await rows(), stored: storedFiles().length }
    const r = await upload('organiser', form(f, file))
    expect(r.status).toBe(status)
    expect(r.body.data.issues[0].path).toBe(path)
    expect(r.body.data.issues[0].message).toMatch(message)
    expect(await rows()).toBe(before.rows)
    expect(storedFiles().length).toBe(before.stored)
    await expect.poll(() => tmpFiles()).toEqual([]) // the staging file goes once the refusal is sent
  })

  it('needs the kind before the file', async () => {
    const r = await upload('organiser', form({ kind: 'other-document' }, { name: 'late.pdf', bytes: pdf() }, true))
    expect(r.status).toBe(422)
    expect(r.body.data.issues[0].path).toBe('kind')
  })

  it('leaves nothing behind when an upload is cut off half-way', async () => {
    const before = await rows()
    const boundary = 'cutoffboundary'
    const head = `--${boundary}\r\nContent-Disposition: form-data; name="kind"\r\n\r\nother-document\r\n--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="cut.pdf"\r\nContent-Type: application/pdf\r\n\r\n`
    const req = request(url(`/api/events/${eventId}/evidence`), { method: 'POST', headers: { 'cookie': cookie.organiser, 'content-type': `multipart/form-data; boundary=${boundary}`, 'content-length': String(head.length + 90_000) } })
    const ended = new Promise<void>((resolve) => {
      req.on('error', () => resolve())
      req.on('response', () => resolve())
      req.on('close', () => resolve())
    })
    req.write(head)
    req.write(pdf())
    req.write(Buffer.alloc(60_000, 32)) // of the 90 000 bytes announced, within the kind's 100 kB limit
    // The upload reached the server: its staging file is there. Then the client goes away.
    await expect.poll(() => tmpFiles().length, { timeout: 5000 }).toBeGreaterThan(0)
    req.destroy()
    await ended
    await expect.poll(() => tmpFiles(), { timeout: 5000 }).toEqual([])
    expect(await rows()).toBe(before)
  })
})

describe('access', () => {
  it('a team attaches a data log to its own run; another team gets 404, by id and by hash', async () => {
    const log = Buffer.from('t_s,speed_kmh\n0.0,391.2\n0.1,391.4\n')
    const r = await upload('team', form({ kind: 'data-log', runId }, { name: 'fennwick-run1.csv', bytes: log }))
    expect(r.status).toBe(201)
    expect(r.body.mediaType).toBe('text/plain')
    expect((await call('GET', `/api/evidence/${r.body.id}`, { cookie: cookie.team2 })).status).toBe(404)
    expect((await call('GET', `/api/evidence/${r.body.id}/content`, { cookie: cookie.team2 })).status).toBe(404)
    expect((await call('GET', `/api/events/${eventId}/evidence/${sha256(log)}`, { cookie: cookie.team2 })).status).toBe(404)
    expect((await call('GET', `/api/events/${eventId}/evidence/${sha256(log)}`, { cookie: cookie.team })).status).toBe(200)
    const list = (await call('GET', `/api/events/${eventId}/evidence`, { cookie: cookie.team2 })).body
    expect(list.some((e: any) => e.id === r.body.id)).toBe(false)
    // The other team cannot attach to this team's run either.
    expect((await upload('team2', form({ kind: 'data-log', runId }, { name: 'x.csv', bytes: log }))).status).toBe(404)
  })

  it('another event\'s evidence answers 404, also by its hash', async () => {
    const bytes = pdf('only at the demo event')
    const r = await upload('organiser', form({ kind: 'survey-certificate', courseId }, { name: 'survey.pdf', bytes }))
    expect(r.status).toBe(201)
    const other = await call('POST', '/api/events', { cookie: cookie.admin, body: { name: 'Evidence test event', venue: 'Test', startsOn: '2026-11-01', endsOn: '2026-11-01', timeZone: 'UTC', profileId: 'intl-motorcycle', organiserEmail: 'evidence-org@example.test', organiserName: 'E O' } })
    expect((await call('GET', `/api/events/${other.body.id}/evidence/${sha256(bytes)}`, { cookie: cookie.admin })).status).toBe(404)
    expect((await call('GET', `/api/events/${eventId}/evidence/${sha256(bytes)}`, { cookie: cookie.admin })).status).toBe(200)
  })
})

describe('a server killed during an upload', () => {
  it('leaves a temporary file that the next start removes, and no row', async () => {
    const env = JSON.parse(inject('serverEnv'))
    const start = () => startApp(env.output, {
      NUXT_DATABASE_URL: env.databaseUrl,
      NUXT_DATA_DIR: env.dataDir,
      NUXT_SERVER_ID: 'restart-test', // the same server restarted: it sweeps its own staging, not the main server's
      NUXT_MAIL_PORT: String(env.smtpPort),
      NUXT_SEED_DEMO: 'true', // the database holds the demo already: nothing is added
    })
    let server = await start()
    const port = server.port
    const before = await rows()
    const boundary = 'killboundary'
    const head = `--${boundary}\r\nContent-Disposition: form-data; name="kind"\r\n\r\nvideo\r\n--${boundary}\r\nContent-Disposition: form-data; name="runId"\r\n\r\n${runId}\r\n--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="run.mp4"\r\n\r\n`
    const req = request(`http://127.0.0.1:${port}/api/events/${eventId}/evidence`, { method: 'POST', headers: { 'cookie': cookie.organiser, 'content-type': `multipart/form-data; boundary=${boundary}`, 'content-length': String(head.length + 10_000_000) } })
    req.on('error', () => {})
    req.write(head)
    req.write(Buffer.alloc(200_000, 1))
    await expect.poll(() => tmpFiles('restart-test').length, { timeout: 5000 }).toBeGreaterThan(0)
    const killed = new Promise(r => server.child.once('exit', r))
    server.child.kill('SIGKILL')
    await killed
    req.destroy()
    expect(tmpFiles('restart-test').length).toBeGreaterThan(0) // the crash left it
    server = await start()
    try {
      await expect.poll(() => tmpFiles('restart-test'), { timeout: 5000 }).toEqual([])
      expect(await rows()).toBe(before)
    }
    finally {
      await server.stop()
    }
  })
})
