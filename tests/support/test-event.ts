import { expect } from 'vitest'
import { addDays, localDate } from '#shared/rules/zoned'
import { call, demoEmail, invitedPerson, login, setPasswordByLink, unique } from './api'
import { organiserOf } from './entries'

type Role = 'organiser' | 'timekeeper' | 'scrutineer' | 'official' | 'team'

/**
 * An event of the test's own under a library rule profile, in a time zone of its choosing: a course
 * with a flying kilometre between two traps, two calibrated timing systems, its own people (one per
 * role, the team's named "Test Team") and a standing record of 400.000 km/h for the partially
 * streamlined electric class (or the class named). Invented set-up, for the test only.
 */
export async function newTestEvent(profileId: string, timeZone: string, recordClass = 'Electric, partially streamlined') {
  const admin = await login(demoEmail('admin'))
  const today = localDate(Date.now(), timeZone)
  const organiserEmail = unique('organiser')
  const created = await call('POST', '/api/events', {
    cookie: admin,
    body: {
      name: `Test event ${organiserEmail}`, venue: 'Test flat', startsOn: addDays(today, -2), endsOn: addDays(today, 2),
      timeZone, profileId, organiserEmail, organiserName: 'Test Organiser',
    },
  })
  expect(created.status, JSON.stringify(created.body)).toBe(201)
  const eventId = created.body.id as number
  const cookie = { organiser: (await setPasswordByLink(organiserEmail, 'organiser-password-1')).cookie } as Record<Role, string>
  const email = { organiser: organiserEmail } as Record<Role, string>
  for (const role of ['timekeeper', 'scrutineer', 'official', 'team'] as const) {
    const at = { eventId, organiser: cookie.organiser, ...(role === 'team' ? { teamName: 'Test Team' } : {}) }
    const person = await invitedPerson(role, 'first-password-1', `Test ${role}`, at)
    cookie[role] = person.cookie
    email[role] = person.email
  }
  const post = async (path: string, body: Record<string, unknown>) => {
    const r = await call('POST', `/api/events/${eventId}/${path}`, { cookie: cookie.organiser, body })
    expect(r.status, JSON.stringify(r.body)).toBe(201)
    return r.body.id as number
  }
  const courseId = await post('courses', { name: 'Test course', headingDeg: '90', surface: 'dry lake', surveyToleranceMm: 10 })
  const kIn = await post('traps', { courseId, label: 'K-in', positionM: '2000', elevationM: '1000' })
  const kOut = await post('traps', { courseId, label: 'K-out', positionM: '3000', elevationM: '1000' })
  await post('distances', { courseId, label: 'Flying kilometre', start: 'flying', nominalM: '1000', entryTrapId: kIn, exitTrapId: kOut })
  const calibration = { calibratedOn: addDays(today, -30), calibrationExpires: addDays(today, 300), toleranceS: '0.002' }
  const primary = await post('timing-systems', { name: 'Test primary', role: 'primary', ticksPerSecond: 10_000, ...calibration })
  const backup = await post('timing-systems', { name: 'Test backup', role: 'backup', ticksPerSecond: 1000, ...calibration })
  await post('records', {
    className: recordClass, distanceLabel: 'Flying kilometre', speed: '400.000', unit: 'km/h',
  })
  // The riders' briefing every profile here requires before any run, held before any run a test types in (some
  // are years back, on the days clocks change); the entry helper signs each new rider on to it.
  await post('briefings', { title: 'Test briefing', heldAt: '2020-01-01T08:00:00Z' })
  const organiserLogin: [string, string] = [organiserEmail, 'organiser-password-1']
  organiserOf.set(eventId, cookie.organiser)
  return { eventId, timeZone, cookie, email, organiserLogin, traps: { 'K-in': kIn, 'K-out': kOut }, systems: { primary, backup } }
}
export type TestEvent = Awaited<ReturnType<typeof newTestEvent>>
