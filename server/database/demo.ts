// The demo scenario, invented from end to end: a speed week on a fictional dry lake, two teams of
// electric motorcycles, one person per role and a site administrator.
import { eq, sql } from 'drizzle-orm'
import { copyProfile, profiles } from '#shared/rules/profiles'
import demo from './demo-people.json'
import * as t from './schema'
import type { Db } from '../utils/db'

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0]

export const DEMO_EVENT = {
  name: 'Tamsel Flat Electric Speed Week',
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
    const [seeded] = await tx.select({ id: t.users.id }).from(t.users).where(eq(t.users.email, demo.people[0]!.email))
    if (seeded) return false

    const ids = new Map<string, number>()
    for (const p of demo.people) {
      const [u] = await tx.insert(t.users).values({ email: p.email, name: p.name, passwordHash, isAdmin: !!p.admin }).returning()
      ids.set(p.email, u!.id)
    }
    const adminId = ids.get('admin@trapline.test')!
    const [event] = await tx.insert(t.events)
      .values({ ...DEMO_EVENT, profile: copyProfile(profiles[DEMO_EVENT.profileId]), createdBy: adminId }).returning()
    const [course] = await tx.insert(t.courses)
      .values({ eventId: event!.id, name: 'North course', headingDeg: '172.00', surface: 'dry lake clay' }).returning()
    await tx.insert(t.traps).values(TRAPS.map(x => ({ ...x, courseId: course!.id })))

    const teamIds = new Map<string, number>()
    for (const name of ['Larkspur Works', 'Cinder Hollow Engineering']) {
      const [team] = await tx.insert(t.teams).values({ eventId: event!.id, name }).returning()
      teamIds.set(name, team!.id)
    }
    await tx.insert(t.machines).values([
      { teamId: teamIds.get('Larkspur Works')!, name: 'Larkspur LS-3 streamliner', power: 'electric', declaredMassKg: '286.0', division: 'full' },
      { teamId: teamIds.get('Cinder Hollow Engineering')!, name: 'Ember Mk II', power: 'electric', declaredMassKg: '212.5', division: 'partial' },
    ])
    await tx.insert(t.riders).values([
      { teamId: teamIds.get('Larkspur Works')!, name: 'Mara Quillfeather', licenceNo: 'DEMO-L-0417', licenceExpires: '2027-03-31' },
      { teamId: teamIds.get('Cinder Hollow Engineering')!, name: 'Jory Vantreese', licenceNo: 'DEMO-L-0982', licenceExpires: '2026-08-12' },
    ])
    for (const p of demo.people) {
      if (!p.role) continue
      await tx.insert(t.memberships).values({
        eventId: event!.id, userId: ids.get(p.email)!, role: p.role as t.EventRole,
        teamId: p.team ? teamIds.get(p.team)! : null, invitedBy: adminId,
      })
    }
    return true
  })
}
