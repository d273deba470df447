// The demo scenario, invented from end to end: record days on a fictional dry lake, two teams of
// electric motorcycles, one person per role and a site administrator.
import { eq, sql } from 'drizzle-orm'
import { copyProfile, profiles } from '#shared/rules/profiles'
import demo from './demo-people.json'
import * as t from './schema'
import type { Db } from '../utils/database/db'
import type { Direction } from '../../shared/constants'

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0]

export const DEMO_EVENT = {
  name: 'Tamsel Flat Electric Record Days',
  venue: 'Tamsel Flat dry lake (fictional)',
  startsOn: '2026-08-10',
  endsOn: '2026-08-14',
  timeZone: 'America/Denver',
  profileId: 'intl-motorcycle' as const,
}

/** Traps of the fictional north course: a flying mile with a flying kilometre centred inside it. */
const TRAPS = [
  { label: 'M-in', positionM: '3000.000', elevationM: '1187.412' },
  { label: 'K-in', positionM: '3304.672', elevationM: '1187.398' },
  { label: 'K-out', positionM: '4304.672', elevationM: '1187.351' },
  { label: 'M-out', positionM: '4609.344', elevationM: '1187.339' },
]

export async function seedDemo(db: Db, hash: (password: string) => Promise<string>) {
  const passwordHash = await hash(demo.password)
  return db.transaction(async (tx: Tx) => {
    await tx.execute(sql`select pg_advisory_xact_lock(727001)`)
    const [seeded] = await tx
      .select({ id: t.users.id })
      .from(t.users)
      .where(eq(t.users.email, demo.people[0]!.email))
    if (seeded) return false

    const ids = new Map<string, number>()
    for (const p of demo.people) {
      const [u] = await tx
        .insert(t.users)
        .values({ email: p.email, name: p.name, passwordHash, isAdmin: !!p.admin })
        .returning()
      ids.set(p.email, u!.id)
    }
    const adminId = ids.get('admin@trapline.test')!
    const [event] = await tx
      .insert(t.events)
      .values({ ...DEMO_EVENT, profile: copyProfile(profiles[DEMO_EVENT.profileId]), createdBy: adminId })
      .returning()
    const [course] = await tx
      .insert(t.courses)
      .values({ eventId: event!.id, name: 'North course', headingDeg: '172.00', surface: 'dry lake clay' })
      .returning()
    const trapRows = await tx
      .insert(t.traps)
      .values(TRAPS.map(x => ({ ...x, courseId: course!.id })))
      .returning()
    const trap = (label: string) => trapRows.find(x => x.label === label)!
    const [mile, km] = await tx
      .insert(t.measuredDistances)
      .values([
        {
          courseId: course!.id,
          label: 'Flying mile',
          start: 'flying',
          nominalM: '1609.344',
          entryTrapId: trap('M-in').id,
          exitTrapId: trap('M-out').id,
        },
        {
          courseId: course!.id,
          label: 'Flying kilometre',
          start: 'flying',
          nominalM: '1000.000',
          entryTrapId: trap('K-in').id,
          exitTrapId: trap('K-out').id,
        },
      ])
      .returning()
    const [primary, backup] = await tx
      .insert(t.timingSystems)
      .values([
        {
          eventId: event!.id,
          name: 'Beam set A',
          role: 'primary',
          ticksPerSecond: 10_000,
          toleranceS: '0.002',
          description: 'Infrared beams with GPS-disciplined clock',
          calibratedOn: '2026-06-02',
          calibrationExpires: '2027-06-01',
        },
        {
          eventId: event!.id,
          name: 'Beam set B',
          role: 'backup',
          ticksPerSecond: 1000,
          toleranceS: '0.002',
          description: 'Independent beams and recorder',
          calibratedOn: '2026-05-20',
          calibrationExpires: '2027-05-19',
        },
      ])
      .returning()
    await tx.insert(t.standingRecords).values([
      {
        eventId: event!.id,
        className: 'Electric, fully streamlined',
        distanceLabel: 'Flying mile',
        speedKmh: '385.000',
        setOn: '2024-09-03',
        note: 'invented for the demo',
      },
      {
        eventId: event!.id,
        className: 'Electric, partially streamlined',
        distanceLabel: 'Flying kilometre',
        speedKmh: '330.000',
        setOn: '2025-08-21',
        note: 'invented for the demo',
      },
    ])

    const teamIds = new Map<string, number>()
    for (const name of ['Larkspur Works', 'Cinder Hollow Engineering']) {
      const [team] = await tx.insert(t.teams).values({ eventId: event!.id, name }).returning()
      teamIds.set(name, team!.id)
    }
    const [fennwick, wisp] = await tx
      .insert(t.machines)
      .values([
        {
          teamId: teamIds.get('Larkspur Works')!,
          name: 'Larkspur Fennwick streamliner',
          power: 'electric',
          declaredMassKg: '286.0',
          division: 'full',
        },
        {
          teamId: teamIds.get('Cinder Hollow Engineering')!,
          name: 'Cinder Wisp',
          power: 'electric',
          declaredMassKg: '212.5',
          division: 'partial',
        },
      ])
      .returning()
    const [mara, jory] = await tx
      .insert(t.riders)
      .values([
        {
          teamId: teamIds.get('Larkspur Works')!,
          name: 'Mara Quillfeather',
          licenceNo: 'DEMO-L-0417',
          licenceExpires: '2027-03-31',
        },
        {
          teamId: teamIds.get('Cinder Hollow Engineering')!,
          name: 'Jory Vantreese',
          licenceNo: 'DEMO-L-0982',
          licenceExpires: '2026-08-12',
        },
      ])
      .returning()
    const [lsEntry, emberEntry] = await tx
      .insert(t.entries)
      .values([
        {
          eventId: event!.id,
          teamId: fennwick!.teamId,
          machineId: fennwick!.id,
          riderId: mara!.id,
          className: 'Electric, fully streamlined',
          distanceId: mile!.id,
        },
        {
          eventId: event!.id,
          teamId: wisp!.teamId,
          machineId: wisp!.id,
          riderId: jory!.id,
          className: 'Electric, partially streamlined',
          distanceId: km!.id,
        },
      ])
      .returning()
    const timekeeperId = ids.get('timekeeper@trapline.test')!
    // Runs of the invented day: a complete pair for the streamliner, a first run for the Wisp.
    const day = [
      {
        entry: lsEntry!,
        direction: 'out' as const,
        startedAt: '2026-08-12T14:05:00Z',
        firstTrap: '08:05:41.2000',
        kmh: 391.2,
      },
      {
        entry: lsEntry!,
        direction: 'back' as const,
        startedAt: '2026-08-12T14:52:00Z',
        firstTrap: '08:52:38.5000',
        kmh: 394.6,
      },
      {
        entry: emberEntry!,
        direction: 'out' as const,
        startedAt: '2026-08-12T15:40:00Z',
        firstTrap: '09:40:35.7500',
        kmh: 336.4,
      },
    ]
    const attemptOf = new Map<number, number>()
    for (const r of day) {
      if (!attemptOf.has(r.entry.id)) {
        const [a] = await tx
          .insert(t.attempts)
          .values({ eventId: event!.id, entryId: r.entry.id, profile: event!.profile })
          .returning()
        attemptOf.set(r.entry.id, a!.id)
      }
      const [run] = await tx
        .insert(t.runs)
        .values({
          eventId: event!.id,
          attemptId: attemptOf.get(r.entry.id)!,
          direction: r.direction,
          startedAt: new Date(r.startedAt),
          status: 'finished',
          createdBy: timekeeperId,
        })
        .returning()
      await tx
        .insert(t.readings)
        .values(
          demoReadings(r.firstTrap, r.kmh, r.direction, trapRows, primary!, backup!).map(x => ({
            ...x,
            runId: run!.id,
            enteredBy: timekeeperId,
          })),
        )
      await tx
        .insert(t.weather)
        .values({
          runId: run!.id,
          windSpeedMs: '2.40',
          windFromDeg: r.direction === 'out' ? '200.00' : '195.00',
          temperatureC: '27.5',
          pressureHpa: '872.4',
          enteredBy: timekeeperId,
        })
    }
    for (const p of demo.people) {
      if (!p.role) continue
      await tx.insert(t.memberships).values({
        eventId: event!.id,
        userId: ids.get(p.email)!,
        role: p.role as t.EventRole,
        teamId: p.team ? teamIds.get(p.team)! : null,
        invitedBy: adminId,
      })
    }
    return true
  })
}

/** Trap times for an invented run at a near-steady speed, on both timing systems. */
function demoReadings(
  firstTrap: string,
  kmh: number,
  direction: Direction,
  traps: { id: number, positionM: string }[],
  primary: { id: number, ticksPerSecond: number },
  backup: { id: number, ticksPerSecond: number },
) {
  const [h, m, s] = firstTrap.split(':').map(Number) as [number, number, number]
  const t0 = h * 3600 + m * 60 + s
  const ordered = [...traps].sort((a, b) => Number(a.positionM) - Number(b.positionM))
  if (direction === 'back') ordered.reverse()
  const start = Number(ordered[0]!.positionM)
  return ordered.flatMap((trap, i) => {
    const v = (kmh + i * 0.35) / 3.6
    const t = t0 + Math.abs(Number(trap.positionM) - start) / v
    return [
      { trapId: trap.id, systemId: primary.id, ticks: BigInt(Math.round(t * primary.ticksPerSecond)) },
      { trapId: trap.id, systemId: backup.id, ticks: BigInt(Math.round((t + 0.0004) * backup.ticksPerSecond)) },
    ]
  })
}
