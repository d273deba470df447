import { beforeAll, describe, expect, it } from 'vitest'
import { call, demoEventId, login, useTestServer } from '../support/api'

await useTestServer()

// Each demo team sees its own attempts' records and never the other's: checked from both sides.
// A record of another team answers 404, as if it did not exist (the trade's practice of keeping a
// team's figures private until the officials publish them is common practice).
const cookie = {} as Record<'organiser' | 'larkspur' | 'cinder', string>
const own = {} as Record<'larkspur' | 'cinder', { attempt: number, dossier: number | null, inspectionSignature: number }>

beforeAll(async () => {
  cookie.organiser = await login('organiser@trapline.test')
  cookie.larkspur = await login('team@trapline.test')
  cookie.cinder = await login('team2@trapline.test')
  const eventId = await demoEventId(cookie.organiser)
  const live = (await call('GET', `/api/events/${eventId}/live`, { cookie: cookie.organiser })).body as any[]
  const inspections = (await call('GET', `/api/events/${eventId}/inspections`, { cookie: cookie.organiser })).body as any[]
  for (const [who, team] of [['larkspur', 'Larkspur Works'], ['cinder', 'Cinder Hollow Engineering']] as const) {
    const attempt = live.find(a => a.entry.teamName === team)
    const dossiers = (await call('GET', `/api/attempts/${attempt.id}/dossiers`, { cookie: cookie.organiser })).body as any[]
    const inspectionId = inspections.find(e => e.team === team).inspectionId
    const inspection = (await call('GET', `/api/inspections/${inspectionId}`, { cookie: cookie.organiser })).body
    own[who] = { attempt: attempt.id, dossier: dossiers[0]?.id ?? null, inspectionSignature: inspection.signature.id }
  }
  // The demo seals the first team's dossier; the second team's attempt has one run and no dossier.
  expect(own.larkspur.dossier).not.toBeNull()
  expect(own.cinder.dossier).toBeNull()
})

describe.each([
  ['the second team', 'cinder', 'larkspur'],
  ['the first team', 'larkspur', 'cinder'],
] as const)('%s, asking for the other team\'s records', (_, me, them) => {
  it('reads its own attempt\'s timing sheet, dossier list and inspection signature', async () => {
    expect((await call('GET', `/api/attempts/${own[me].attempt}/timing-sheet`, { cookie: cookie[me] })).status).toBe(200)
    expect((await call('GET', `/api/attempts/${own[me].attempt}/dossiers`, { cookie: cookie[me] })).status).toBe(200)
    expect((await call('GET', `/api/signatures/${own[me].inspectionSignature}`, { cookie: cookie[me] })).status).toBe(200)
  })

  it('gets 404 for the other team\'s timing sheet, readiness, dossier list and signatures', async () => {
    for (const path of [
      `/api/attempts/${own[them].attempt}/timing-sheet`,
      `/api/attempts/${own[them].attempt}/readiness`,
      `/api/attempts/${own[them].attempt}/dossiers`,
      `/api/signatures/${own[them].inspectionSignature}`,
    ]) {
      expect((await call('GET', path, { cookie: cookie[me] })).status, path).toBe(404)
    }
  })

  it('cannot build, submit or download through the other team\'s attempt and dossier', async () => {
    expect((await call('POST', `/api/attempts/${own[them].attempt}/dossiers`, { cookie: cookie[me] })).status).toBe(404)
    const dossier = own[them].dossier ?? own[me].dossier
    if (own[them].dossier) {
      expect((await call('POST', `/api/dossiers/${dossier}/submission`, { cookie: cookie[me] })).status).toBe(404)
    }
    else {
      // The other team has no dossier: the check is that this team's own one is not the other's to submit.
      expect((await call('POST', `/api/dossiers/${dossier}/submission`, { cookie: cookie[them] })).status).toBe(404)
    }
  })
})
