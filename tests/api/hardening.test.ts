import { describe, expect, it } from 'vitest'
import { call, useTestServer } from '../support/api'

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
