import { beforeAll, describe, expect, it } from 'vitest'
import { call, demoEmail, demoEventId, login, useTestServer } from '../support/api'

await useTestServer()

// The planner's API: computed for anyone from the figures given (the same engine as the page); saved plans are
// private to their team; a plan is compared with the measured runs of the team's attempt. The demo's plan and
// figures are invented.
const input = {
  machine: { massKg: 320, rotatingMassKg: 20, cdA: 0.12, crr: 0.012, efficiency: 0.92, power: { kind: 'constant', kW: 150 }, maxTractiveN: 2500 },
  conditions: { altitudeM: 1290, temperatureC: 27.5, pressureHpa: 872.4, windMs: 2, windFromDeg: 0 },
  course: { label: 'Flying mile', lengthM: 8000, headingDeg: 0, entryM: 3500, exitM: 5109.344 },
  shutdown: { decelerationMs2: 3, marginM: 300 },
  profileId: 'intl-motorcycle',
  recordKmh: 330,
  turnaroundMin: 45,
}
const cookie = {} as Record<'team' | 'team2' | 'organiser', string>
beforeAll(async () => {
  cookie.team = await login('team@trapline.test')
  cookie.team2 = await login('team2@trapline.test')
  cookie.organiser = await login(demoEmail('organiser'))
})

describe('computing a plan', () => {
  it('answers the plan without sign-in, with both runs, the result and what would beat the record', async () => {
    const r = await call('POST', '/api/planner', { body: input })
    expect(r.status, JSON.stringify(r.body)).toBe(200)
    expect(r.body.profile).toBe('International motorcycle')
    expect(r.body.plan.runs.map((x: { direction: string }) => x.direction)).toEqual(['out', 'back'])
    // Distance over the mean time (the profile's averaging), as the engine gives it.
    const [out, back] = r.body.plan.runs
    expect(r.body.plan.result.kmh).toBeCloseTo((1609.344 / ((out.timeS + back.timeS) / 2)) * 3.6, 9)
    expect(r.body.plan.sensitivity).toHaveLength(9)
    // The international motorcycle profile asks only to exceed the record (no margin): 330 km/h is what is needed.
    expect(r.body.plan.record.requiredKmh).toBe(330)
    // The power it says would do reaches exactly that when planned with.
    const { powerKW } = r.body.plan.needed
    const again = await call('POST', '/api/planner', {
      body: { ...input, machine: { ...input.machine, power: { kind: 'constant', kW: Number(powerKW.toFixed(6)) } } },
    })
    expect(again.body.plan.result.kmh).toBeCloseTo(330, 3)
  })
  it('names the field of a figure that cannot be', async () => {
    const r = await call('POST', '/api/planner', { body: { ...input, course: { ...input.course, exitM: 9000 } } })
    expect(r.status).toBe(422)
    expect(r.body.data.issues).toContainEqual({ path: 'course.exitM', message: 'must lie inside the course' })
    const curve = await call('POST', '/api/planner', {
      body: { ...input, machine: { ...input.machine, power: { kind: 'curve', points: [{ kmh: 200, kW: 150 }, { kmh: 100, kW: 150 }] } } },
    })
    expect(curve.body.data.issues[0]).toEqual({ path: 'machine.power.points', message: 'speeds must rise from point to point' })
  })
})

describe('saved plans', () => {
  let teamId = 0
  let planId = 0
  it('are saved for one\'s own team only, and its machines', async () => {
    const me = (await call('GET', '/api/me', { cookie: cookie.team2 })).body
    teamId = me.memberships.find((m: { role: string }) => m.role === 'team').teamId
    const other = (await call('GET', '/api/me', { cookie: cookie.team })).body.memberships.find((m: { role: string }) => m.role === 'team').teamId
    const notMine = await call('POST', '/api/plans', { cookie: cookie.team2, body: { teamId: other, name: 'Borrowed', input } })
    expect(notMine.body.data.issues[0].path).toBe('teamId')
    const eventId = await demoEventId(cookie.organiser)
    const theirMachine = (await call('GET', `/api/events/${eventId}`, { cookie: cookie.organiser })).body.teams
      .find((t: { id: number }) => t.id === other).machines[0].id
    const wrongMachine = await call('POST', '/api/plans', { cookie: cookie.team2, body: { teamId, machineId: theirMachine, name: 'Wisp', input } })
    expect(wrongMachine.body.data.issues[0].path).toBe('machineId')
    const ok = await call('POST', '/api/plans', { cookie: cookie.team2, body: { teamId, name: 'Wisp, north course', input } })
    expect(ok.status, JSON.stringify(ok.body)).toBe(201)
    planId = ok.body.id
  })
  it('are seen and changed by the team alone', async () => {
    expect((await call('GET', `/api/plans/${planId}`, { cookie: cookie.team })).status).toBe(404)
    expect((await call('GET', `/api/plans/${planId}`, { cookie: cookie.organiser })).status).toBe(404)
    expect((await call('GET', '/api/plans', { cookie: cookie.organiser })).body).toEqual([])
    expect((await call('GET', '/api/plans', { cookie: cookie.team })).body.map((p: { id: number }) => p.id)).not.toContain(planId)
    const changed = await call('PUT', `/api/plans/${planId}`, {
      cookie: cookie.team2, body: { teamId, name: 'Wisp, more power', input: { ...input, machine: { ...input.machine, power: { kind: 'constant', kW: 165 } } } },
    })
    expect(changed.status).toBe(200)
    const read = (await call('GET', `/api/plans/${planId}`, { cookie: cookie.team2 })).body
    expect(read.name).toBe('Wisp, more power')
    const before = (await call('POST', '/api/planner', { body: input })).body.plan.result.kmh
    expect(read.computed.result.kmh).toBeGreaterThan(before)
    expect((await call('PUT', `/api/plans/${planId}`, { cookie: cookie.team, body: { teamId, name: 'x', input } })).status).toBe(404)
  })
  it('compares with the measured runs of the team\'s attempt, not another team\'s', async () => {
    const demoPlan = (await call('GET', '/api/plans', { cookie: cookie.team })).body
      .find((p: { name: string }) => p.name === 'North course, flying mile, run-day air')
    const eventId = await demoEventId(cookie.organiser)
    const live = (await call('GET', `/api/events/${eventId}/live`, { cookie: cookie.team })).body
    const streamliner = live.find((a: { entry: { teamName: string }, result: unknown }) => a.entry.teamName === 'Larkspur Works' && a.result)
    const r = await call('GET', `/api/plans/${demoPlan.id}/comparison?attemptId=${streamliner.id}`, { cookie: cookie.team })
    expect(r.status, JSON.stringify(r.body)).toBe(200)
    const counted = streamliner.runs.filter((x: { status: string }) => x.status !== 'aborted')
    expect(r.body.runs.map((x: { measuredKmh: number }) => x.measuredKmh)).toEqual(counted.map((x: { official: { kmh: string } }) => Number(x.official.kmh)))
    expect(r.body.resultKmh).toBe(Number(streamliner.result.kmh))
    expect(r.body.planned.out).toBeGreaterThan(300)
    const wisp = live.find((a: { entry: { teamName: string } }) => a.entry.teamName === 'Cinder Hollow Engineering')
    const theirs = await call('GET', `/api/plans/${demoPlan.id}/comparison?attemptId=${wisp.id}`, { cookie: cookie.team })
    expect(theirs.body.data.issues[0].path).toBe('attemptId')
  })
})
