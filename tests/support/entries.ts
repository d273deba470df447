import { expect } from 'vitest'
import { allItems } from '#shared/inspection/evaluate'
import { combustionMotorcycle, electricMotorcycle } from '#shared/inspection/templates'
import { call, DEMO_PASSWORD, demoEmail, login } from './api'

/**
 * A new entry of the second demo team over the flying kilometre (or the distances named in `who.claims`),
 * owned by the test that makes it: its runs and attempts touch no other test's.
 */
export async function newEntry(
  eventId: number,
  machineName: string,
  rider: RiderFacts = {},
  who: {
    team?: string
    organiser?: string
    claims?: string[]
    entry?: { className?: string, division?: string, power?: 'electric' | 'combustion' }
  } = {},
) {
  const team2 = who.team ?? await login('team2@trapline.test')
  const setup = (await call('GET', `/api/events/${eventId}/setup`, { cookie: team2 })).body
  const distanceId = (label: string) => setup.distances.find((d: { label: string }) => d.label === label).id
  const claims = who.claims ? { distanceIds: who.claims.map(distanceId) } : { distanceId: distanceId('Flying kilometre') }
  const entry = await call('POST', `/api/events/${eventId}/entries`, {
    cookie: team2,
    body: {
      machine: {
        name: machineName, power: who.entry?.power ?? 'electric', declaredMassKg: '180.0', division: who.entry?.division ?? 'partial',
      },
      // Graded where the profile grades licences ('unlimited' covers the 290 km/h declared at inspection and the
      // 400–405 km/h the test pairs reach), with a medical where it requires one.
      rider: {
        name: 'Test Rider', licenceNo: 'DEMO-T-1', licenceExpires: rider.licenceExpires ?? '2099-12-31',
        licenceGrade: 'licenceGrade' in rider ? rider.licenceGrade : 'unlimited',
        medicalExpires: 'medicalExpires' in rider ? rider.medicalExpires : '2099-12-31',
      },
      className: who.entry?.className ?? 'Electric, partially streamlined',
      ...claims,
    },
  })
  expect(entry.status, JSON.stringify(entry.body)).toBe(201)
  if (!rider.skipBriefing) await signOnLatestBriefing(eventId, entry.body.id, who.organiser ?? organiserOf.get(eventId))
  return entry.body.id as number
}

export interface RiderFacts {
  licenceExpires?: string
  licenceGrade?: string | null
  medicalExpires?: string | null
  /** Leave the rider off the event's latest briefing (a rider who missed it). */
  skipBriefing?: boolean
}

/** The organiser's cookie of each test event made by `newTestEvent`; the demo's organiser otherwise. */
export const organiserOf = new Map<number, string>()

/** A 1×1 PNG: the mark a rider draws when signing on in person (its look is not what is tested). */
export const DRAWN = 'data:image/png;base64,iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAQAAAC1HAwCAAAAC0lEQVR42mNkYAAAAAYAAjCB0C8AAAAASUVORK5CYII='

/**
 * Where the event has held a riders' briefing, the entry's rider signs on to the latest, in person on the
 * organiser's device, as every rider does before running (the demo holds one; test events none unless told).
 */
export async function signOnLatestBriefing(eventId: number, entryId: number, organiser?: string) {
  const cookie = organiser ?? await login(demoEmail('organiser'))
  const list = (await call('GET', `/api/events/${eventId}/briefings`, { cookie })).body
  const latest = list.briefings?.[0]
  if (!latest) return
  const rider = await riderOfEntry(eventId, entryId, cookie)
  expect(rider, `the rider of entry ${entryId}`).toBeTruthy()
  if (latest.signOns.some((s: { riderId: number }) => s.riderId === rider.id)) return
  const r = await call('POST', `/api/briefings/${latest.id}/sign-ons`, {
    cookie, body: { onDevice: 'organiser', riderId: rider.id, typedName: rider.name, drawingPng: DRAWN },
  })
  expect(r.status, JSON.stringify(r.body)).toBe(201)
}

async function riderOfEntry(eventId: number, entryId: number, cookie: string) {
  const riders = (await call('GET', `/api/events/${eventId}/briefings`, { cookie })).body.riders as
    { id: number, name: string, entryIds: number[] }[]
  return riders.find(r => r.entryIds.includes(entryId))!
}
/**
 * The figures an electric test machine is judged against: a 400 V DC bus, declared at 290 km/h, and the division
 * the scrutineer sees (the test entries' own: partially streamlined).
 */
export const FIGURES = { busVoltageV: 400, busKind: 'dc', declaredSpeed: 290, division: 'partial' }

/**
 * Answers every item of the electric motorcycle checklist (or the one given): pass, or fail for the one named.
 */
export async function answerAll(
  inspectionId: number,
  failing?: string,
  who: { scrutineer?: string } = {},
  checklist = electricMotorcycle,
  overrides: Record<string, [number, string]> = {},
) {
  const scrutineer = who.scrutineer ?? await login(demoEmail('scrutineer'))
  for (const i of allItems(checklist)) {
    const result = i.key === failing ? 'fail' : 'pass'
    // Within every limit at 400 V DC and a declared 290 km/h (see `FIGURES`): 80 kΩ is 200 Ω/V (UN ECE R100
    // 5.1.3: 100 Ω/V), one parachute over 175 mph (club rules, from memory), tyres rated 450 km/h (over the 400–405
    // km/h the test pairs reach: the speed reached is held against the rating before the next run).
    const measured: Record<string, [number, string]> = {
      'isolation': [80, 'kΩ'],
      'bonding': [0.05, 'Ω'],
      'canopy-exit': [12, 's'],
      'mass': [181.5, 'kg'],
      'parachute': [1, 'count'],
      'tyres-rated': [450, 'km/h'],
      'engine-capacity': [998, 'cm³'],
      ...overrides,
    }
    const [value, unit] = measured[i.key] ?? []
    const r = await call('POST', `/api/inspections/${inspectionId}/answers`, {
      cookie: scrutineer,
      body: { itemKey: i.key, result, value, unit },
    })
    expect(r.status, JSON.stringify(r.body)).toBe(200)
  }
}

/** A new entry inspected, passed and signed off by the scrutineer (the demo's unless told): cleared to run. */
export async function clearedEntry(
  eventId: number,
  machineName: string,
  rider: RiderFacts = {},
  who: {
    team?: string
    organiser?: string
    scrutineer?: string
    scrutineerPassword?: string
    claims?: string[]
    entry?: { className?: string, division?: string, power?: 'electric' | 'combustion' }
    /** Measurements other than the test figures, e.g. wheels rated for a machine that runs at 1000 km/h. */
    measured?: Record<string, [number, string]>
  } = {},
) {
  const entryId = await newEntry(eventId, machineName, rider, who)
  const scrutineer = who.scrutineer ?? await login(demoEmail('scrutineer'))
  const combustion = who.entry?.power === 'combustion'
  const started = await call('POST', `/api/events/${eventId}/inspections`, {
    cookie: scrutineer,
    body: { entryId, baseId: combustion ? 'combustion-motorcycle' : 'electric-motorcycle' },
  })
  expect(started.status, JSON.stringify(started.body)).toBe(201)
  const id = started.body.id as number
  // A combustion machine has no high-voltage bus: its figures are the declared speed alone.
  const division = who.entry?.division ?? FIGURES.division
  const figures = combustion ? { declaredSpeed: FIGURES.declaredSpeed, division } : { ...FIGURES, division }
  const patched = await call('PATCH', `/api/inspections/${id}`, { cookie: scrutineer, body: figures })
  expect(patched.status, JSON.stringify(patched.body)).toBe(200)
  await answerAll(id, undefined, { scrutineer }, combustion ? combustionMotorcycle : electricMotorcycle, who.measured)
  // The name typed is the scrutineer's name on file: a signature names the person who gives it.
  const { name } = (await call('GET', '/api/me', { cookie: scrutineer })).body.user as { name: string }
  const signed = await call('POST', `/api/inspections/${id}/signatures`, {
    cookie: scrutineer,
    body: { password: who.scrutineerPassword ?? DEMO_PASSWORD, typedName: name },
  })
  expect(signed.status, JSON.stringify(signed.body)).toBe(201)
  return entryId
}
