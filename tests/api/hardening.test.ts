import { describe, expect, it } from 'vitest'
import { call, demoEmail, demoEventId, login, url, useTestServer } from '../support/api'

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
    const big = JSON.stringify({ email: 'x@example.test', password: 'p'.repeat(2_000_000) })
    const declared = await fetch(url('/api/auth/login'), { method: 'POST', headers: { 'content-type': 'application/json' }, body: big })
    expect(declared.status).toBe(413)
    // Sent in chunks with no length: counted as it arrives.
    const stream = new ReadableStream({
      start(c) {
        for (let i = 0; i < 20; i++) c.enqueue(new TextEncoder().encode(i ? 'x'.repeat(100_000) : '{"email":"'))
        c.close()
      },
    })
    const chunked = await fetch(url('/api/auth/login'), { method: 'POST', headers: { 'content-type': 'application/json' }, body: stream, duplex: 'half' } as RequestInit)
    expect(chunked.status).toBe(413)
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
