// The demo scenario, invented from end to end: record days on a fictional dry lake, two teams of
// electric motorcycles, one person per role and a site administrator. Every date is relative to the
// day the demo is seeded, so certificates and licences are valid whenever it is seeded.
import { eq, sql } from 'drizzle-orm'
import { copyProfile, profiles } from '#shared/rules/profiles'
import { addDays, localDate, localMidnight } from '#shared/rules/zoned'
import demo from './demo-people.json'
import * as t from './schema'
import type { Db, Tx } from '../utils/database/db'
import type { Direction, EventRole, OfficialFunction } from '../../shared/constants'

export const DEMO_TIME_ZONE = 'America/Denver'
const TIME_ZONE = DEMO_TIME_ZONE

/** The demo's calendar: the runs were yesterday (event time); the event runs from two days before to two after. */
export function demoCalendar(today: string) {
  const runDay = addDays(today, -1)
  return {
    runDay,
    startsOn: addDays(runDay, -2),
    endsOn: addDays(runDay, 2),
    surveyedOn: addDays(runDay, -15),
    primaryCalibration: { calibratedOn: addDays(runDay, -71), calibrationExpires: addDays(runDay, 293) },
    backupCalibration: { calibratedOn: addDays(runDay, -84), calibrationExpires: addDays(runDay, 280) },
    /** The streamliner's rider holds a licence valid well past the event. */
    longLicence: addDays(runDay, 231),
    /** The second team's rider's licence runs out on the run day, before the event ends. */
    shortLicence: runDay,
    /** Both riders' medicals are valid through the event. */
    medical: addDays(runDay, 160),
  }
}
export type DemoCalendar = ReturnType<typeof demoCalendar>

/** The seeding day in the event's zone. */
export const demoToday = (now = new Date()) => localDate(now.getTime(), TIME_ZONE)

const demoEvent = (cal: DemoCalendar) => ({
  name: 'Tamsel Flat Electric Record Days',
  venue: 'Tamsel Flat dry lake (fictional)',
  startsOn: cal.startsOn,
  endsOn: cal.endsOn,
  timeZone: TIME_ZONE,
  profileId: 'intl-motorcycle' as const,
  /** The demo's organiser has opened the public live board. */
  publicBoard: true,
})

/** Traps of the fictional north course: a flying mile with a flying kilometre centred inside it. */
const TRAPS = [
  { label: 'M-in', positionM: '3000.000', elevationM: '1187.412' },
  { label: 'K-in', positionM: '3304.672', elevationM: '1187.398' },
  { label: 'K-out', positionM: '4304.672', elevationM: '1187.351' },
  { label: 'M-out', positionM: '4609.344', elevationM: '1187.339' },
]

/**
 * Seeds the demo once (a second call finds it and returns false). `today` is the seeding day
 * (YYYY-MM-DD, event time); the demo's dates follow from it.
 */
export async function seedDemo(db: Db, hash: (password: string) => Promise<string>, today = demoToday()) {
  const passwordHash = await hash(demo.password)
  const cal = demoCalendar(today)
  return db.transaction(async (tx) => {
    await tx.execute(sql`select pg_advisory_xact_lock(727001)`)
    const [seeded] = await tx.select({ id: t.users.id }).from(t.users).where(eq(t.users.email, demo.people[0]!.email))
    if (seeded) return false
    const people = await seedPeople(tx, passwordHash)
    const event = await seedEvent(tx, cal, people.get('admin@trapline.test')!)
    const course = await seedCourse(tx, event.id)
    const systems = await seedTimingSystems(tx, event.id, cal)
    await seedStandingRecords(tx, event.id)
    const teams = await seedTeams(tx, event.id)
    const entries = await seedEntries(tx, event.id, course, teams, cal)
    await seedRuns(tx, { event, cal, course, systems, entries, timekeeperId: people.get('timekeeper@trapline.test')! })
    await seedMemberships(tx, event.id, people, teams)
    await seedFees(tx, event.id, entries, people.get('team@trapline.test')!, cal)
    await seedOfficials(tx, event.id, people, cal)
    return true
  })
}

/**
 * The demo's fees (invented amounts, in euros as cents): the streamliner's entry fee paid through the provider
 * before the event (a receipt of its own), the second team's not yet. Payment is not required before a run.
 */
async function seedFees(tx: Tx, eventId: number, entries: Awaited<ReturnType<typeof seedEntries>>, teamUserId: number,
  cal: DemoCalendar) {
  await tx.insert(t.eventFees)
    .values({ eventId, currency: 'eur', entryMinor: 18_000, recordMinor: 4_500, requirePayment: false })
  await tx.insert(t.payments).values({
    eventId, entryId: entries[0].id, fee: 'entry', amountMinor: 18_000, currency: 'eur', status: 'paid',
    providerSessionId: 'cs_demo_larkspur_entry', providerPaymentId: 'pi_demo_larkspur_entry', receiptNo: 'R-DEMO-1',
    createdBy: teamUserId, paidAt: new Date(`${cal.startsOn}T09:00:00Z`),
  })
}

/** The demo's permit (an invented federation) and its officials in the functions the profile requires. */
async function seedOfficials(tx: Tx, eventId: number, people: Map<string, number>, cal: DemoCalendar) {
  await tx.insert(t.eventPermits).values({
    eventId, issuingBody: 'Tamsel Motorcycling Federation (fictional)', number: 'TMF-P-0417', validFrom: cal.startsOn,
    validTo: cal.endsOn,
  })
  const by = people.get('organiser@trapline.test')!
  const holders: [OfficialFunction, string][] = [
    ['clerk-of-course', 'official@trapline.test'],
    ['chief-timekeeper', 'timekeeper@trapline.test'],
    ['chief-scrutineer', 'scrutineer@trapline.test'],
    ['observer', 'official2@trapline.test'],
    ['steward', 'official2@trapline.test'],
    // The profile's stewards decide as a panel, two signing (intl-motorcycle): a second steward of no other function.
    ['steward', 'official3@trapline.test'],
  ]
  await tx.insert(t.appointments).values(holders.map(([fn, email]) =>
    ({ eventId, function: fn, userId: people.get(email)!, appointedBy: by })))
}

async function seedPeople(tx: Tx, passwordHash: string) {
  const ids = new Map<string, number>()
  for (const p of demo.people) {
    const [u] = await tx
      .insert(t.users)
      .values({ email: p.email, name: p.name, passwordHash, isAdmin: !!p.admin })
      .returning()
    ids.set(p.email, u!.id)
  }
  return ids
}

async function seedEvent(tx: Tx, cal: DemoCalendar, adminId: number) {
  const values = demoEvent(cal)
  const [event] = await tx
    .insert(t.events)
    .values({ ...values, profile: copyProfile(profiles[values.profileId]), createdBy: adminId })
    .returning()
  return event!
}

/** The north course, its traps, and the flying mile and kilometre between them. */
async function seedCourse(tx: Tx, eventId: number) {
  const [course] = await tx
    .insert(t.courses)
    .values({ eventId, name: 'North course', headingDeg: '172.00', surface: 'dry lake clay' })
    .returning()
  const traps = await tx.insert(t.traps).values(TRAPS.map(x => ({ ...x, courseId: course!.id }))).returning()
  const trap = (label: string) => traps.find(x => x.label === label)!.id
  const flying = { courseId: course!.id, start: 'flying' as const }
  const [mile, km] = await tx
    .insert(t.measuredDistances)
    .values([
      { ...flying, label: 'Flying mile', nominalM: '1609.344', entryTrapId: trap('M-in'), exitTrapId: trap('M-out') },
      {
        ...flying,
        label: 'Flying kilometre',
        nominalM: '1000.000',
        entryTrapId: trap('K-in'),
        exitTrapId: trap('K-out'),
      },
    ])
    .returning()
  return { course: course!, traps, mile: mile!, km: km! }
}
type DemoCourse = Awaited<ReturnType<typeof seedCourse>>

async function seedTimingSystems(tx: Tx, eventId: number, cal: DemoCalendar) {
  const [primary, backup] = await tx
    .insert(t.timingSystems)
    .values([
      {
        eventId,
        name: 'Beam set A',
        role: 'primary',
        ticksPerSecond: 10_000,
        toleranceS: '0.002',
        description: 'Infrared beams with GPS-disciplined clock',
        timeBase: 'local' as const,
        synchronisation: 'to GPS time by its receiver, checked against it at 06:40 on the run day',
        ...cal.primaryCalibration,
      },
      {
        eventId,
        name: 'Beam set B',
        role: 'backup',
        ticksPerSecond: 1000,
        toleranceS: '0.002',
        description: 'Independent beams and recorder',
        timeBase: 'local' as const,
        synchronisation: 'to the primary\'s clock by hand at 06:45 on the run day',
        ...cal.backupCalibration,
      },
    ])
    .returning()
  return { primary: primary!, backup: backup! }
}
type DemoSystems = Awaited<ReturnType<typeof seedTimingSystems>>

async function seedStandingRecords(tx: Tx, eventId: number) {
  const invented = { eventId, note: 'invented for the demo' }
  await tx.insert(t.standingRecords).values([
    {
      ...invented,
      className: 'Electric, fully streamlined',
      distanceLabel: 'Flying mile',
      // Published in mph, as many records are: compared in mph at its exact decimal.
      speed: '239.227',
      unit: 'mph',
      setOn: '2024-09-03',
    },
    {
      ...invented,
      className: 'Electric, partially streamlined',
      distanceLabel: 'Flying kilometre',
      speed: '330.000',
      unit: 'km/h',
      setOn: '2025-08-21',
    },
    {
      // A vacant class: no record yet, a first record must reach the organiser's minimum.
      eventId,
      note: 'minimum for the vacant class, set by the organiser (invented for the demo)',
      className: 'Electric, unstreamlined',
      distanceLabel: 'Flying kilometre',
      speed: '250.000',
      unit: 'km/h',
      minimum: true,
    },
  ])
}

async function seedTeams(tx: Tx, eventId: number) {
  const ids = new Map<string, number>()
  for (const name of ['Larkspur Works', 'Cinder Hollow Engineering']) {
    const [team] = await tx.insert(t.teams).values({ eventId, name }).returning()
    ids.set(name, team!.id)
  }
  return ids
}

/** Each team's machine, rider and entry: the streamliner for the mile and the kilometre, the Wisp for the kilometre. */
async function seedEntries(tx: Tx, eventId: number, c: DemoCourse, teams: Map<string, number>, cal: DemoCalendar) {
  const plan = [
    {
      team: teams.get('Larkspur Works')!,
      machine: { name: 'Larkspur Fennwick streamliner', declaredMassKg: '286.0', division: 'full' as const },
      rider: { name: 'Mara Quillfeather', licenceNo: 'DEMO-L-0417', licenceExpires: cal.longLicence,
        medicalExpires: cal.medical },
      className: 'Electric, fully streamlined',
      // One pass timed over both: the flying kilometre lies inside the flying mile.
      distanceIds: [c.mile.id, c.km.id],
    },
    {
      team: teams.get('Cinder Hollow Engineering')!,
      machine: { name: 'Cinder Wisp', declaredMassKg: '212.5', division: 'partial' as const },
      rider: { name: 'Jory Vantreese', licenceNo: 'DEMO-L-0982', licenceExpires: cal.shortLicence,
        medicalExpires: cal.medical },
      className: 'Electric, partially streamlined',
      distanceIds: [c.km.id],
    },
  ]
  const entries = []
  for (const p of plan) {
    const [machine] = await tx
      .insert(t.machines)
      .values({ ...p.machine, teamId: p.team, power: 'electric' })
      .returning()
    const [rider] = await tx.insert(t.riders).values({ ...p.rider, teamId: p.team }).returning()
    const [entry] = await tx
      .insert(t.entries)
      .values({
        eventId,
        teamId: p.team,
        machineId: machine!.id,
        riderId: rider!.id,
        className: p.className,
        distanceId: p.distanceIds[0]!,
        distanceIds: p.distanceIds,
      })
      .returning()
    entries.push(entry!)
  }
  return entries as [typeof entries[number], typeof entries[number]]
}

interface RunsContext {
  event: typeof t.events.$inferSelect
  cal: DemoCalendar
  course: DemoCourse
  systems: DemoSystems
  entries: Awaited<ReturnType<typeof seedEntries>>
  timekeeperId: number
}

/**
 * Runs of the invented day, at local times on the run day: a complete pair for the streamliner
 * (out at 08:05, back at 08:52) and a first run for the Wisp (09:40), with weather at each.
 */
async function seedRuns(tx: Tx, ctx: RunsContext) {
  const [streamliner, wisp] = ctx.entries
  const hms = (h: number, m: number, s: number) => h * 3600 + m * 60 + s
  const plan = [
    { entry: streamliner, direction: 'out' as const, startS: hms(8, 5, 0), firstTrapS: hms(8, 5, 41.2), kmh: 391.2 },
    { entry: streamliner, direction: 'back' as const, startS: hms(8, 52, 0), firstTrapS: hms(8, 52, 38.5), kmh: 394.6 },
    { entry: wisp, direction: 'out' as const, startS: hms(9, 40, 0), firstTrapS: hms(9, 40, 35.75), kmh: 336.4 },
  ]
  const midnight = localMidnight(ctx.cal.runDay, ctx.event.timeZone)
  const attemptOf = new Map<number, number>()
  for (const r of plan) {
    if (!attemptOf.has(r.entry.id)) {
      const [a] = await tx
        .insert(t.attempts)
        .values({ eventId: ctx.event.id, entryId: r.entry.id, profile: ctx.event.profile })
        .returning()
      attemptOf.set(r.entry.id, a!.id)
    }
    const startedAt = new Date(midnight + r.startS * 1000)
    const [run] = await tx
      .insert(t.runs)
      .values({
        eventId: ctx.event.id,
        attemptId: attemptOf.get(r.entry.id)!,
        direction: r.direction,
        startedAt,
        status: 'finished',
        createdBy: ctx.timekeeperId,
      })
      .returning()
    const readings = demoReadings(r.firstTrapS, r.kmh, r.direction, ctx.course.traps, ctx.systems)
    await tx.insert(t.readings).values(readings.map(x => ({ ...x, runId: run!.id, enteredBy: ctx.timekeeperId })))
    await tx.insert(t.weather).values({
      runId: run!.id,
      windSpeedMs: '2.40',
      windFromDeg: r.direction === 'out' ? '200.00' : '195.00',
      temperatureC: '27.5',
      pressureHpa: '872.4',
      enteredBy: ctx.timekeeperId,
    })
  }
}

async function seedMemberships(tx: Tx, eventId: number, people: Map<string, number>, teams: Map<string, number>) {
  const adminId = people.get('admin@trapline.test')!
  for (const p of demo.people) {
    if (!p.role) continue
    await tx.insert(t.memberships).values({
      eventId,
      userId: people.get(p.email)!,
      role: p.role as EventRole,
      teamId: p.team ? teams.get(p.team)! : null,
      invitedBy: adminId,
    })
  }
}

/** Trap times (seconds after local midnight) of an invented run at a near-steady speed, on both systems. */
function demoReadings(
  firstTrapS: number,
  kmh: number,
  direction: Direction,
  traps: { id: number, positionM: string }[],
  { primary, backup }: DemoSystems,
) {
  const ordered = [...traps].sort((a, b) => Number(a.positionM) - Number(b.positionM))
  if (direction === 'back') ordered.reverse()
  const start = Number(ordered[0]!.positionM)
  return ordered.flatMap((trap, i) => {
    const v = (kmh + i * 0.35) / 3.6
    const at = firstTrapS + Math.abs(Number(trap.positionM) - start) / v
    return [
      { trapId: trap.id, systemId: primary.id, ticks: BigInt(Math.round(at * primary.ticksPerSecond)) },
      { trapId: trap.id, systemId: backup.id, ticks: BigInt(Math.round((at + 0.0004) * backup.ticksPerSecond)) },
    ]
  })
}
