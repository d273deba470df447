import { generateKeyPairSync, randomBytes } from 'node:crypto'
import { eq } from 'drizzle-orm'
import { isoBase64URL, isoCBOR } from '@simplewebauthn/server/helpers'
import { allItems } from '#shared/inspection/evaluate'
import { addDays, localMidnight, localToInstant } from '#shared/rules/zoned'
import { DEMO_TIME_ZONE, demoCalendar, demoToday, seedDemo } from '../../database/demo'
import demo from '../../database/demo-people.json'
import type { StagedFile } from '../evidence/uploads'

let seeding: Promise<unknown> = Promise.resolve()

/** Resolves once the demo scenario is in the database (at once when the demo is off). */
export const demoSeeded = () => seeding

export function startDemoSeed() {
  const today = String(useRuntimeConfig().demoToday || '') || undefined
  seeding = sealKeysReady()
    .then(() => seedDemo(useDb(), hashPassword, today))
    .then(async (created) => {
      if (created) {
        await seedDemoInspections()
        await seedDemoDossier()
      }
      console.info(created ? '[trapline] demo scenario seeded' : '[trapline] demo scenario already present')
    })
    .catch((error) => {
      console.error('[trapline] demo seed failed', error)
      throw error
    })
}

/** Both demo machines inspected and signed off by the demo scrutineer, through the same code as the app. */
async function seedDemoInspections() {
  const [scrutineer] = await useDb()
    .select()
    .from(tables.users)
    .where(eq(tables.users.email, 'scrutineer@trapline.test'))
  const entries = await useDb()
    .select({ entry: tables.entries, machine: tables.machines })
    .from(tables.entries)
    .innerJoin(tables.machines, eq(tables.machines.id, tables.entries.machineId))
  // Real-looking figures: a 400 V DC bus at 2.4 MΩ is 6000 Ω/V, well over the 100 Ω/V of UN ECE R100
  // 5.1.3; the streamliner declared at 420 km/h (one parachute over 175 mph), the other at 360 km/h.
  const measured: Record<string, [string, string]> = {
    'isolation': ['2.4', 'MΩ'],
    'bonding': ['0.03', 'Ω'],
    'canopy-exit': ['21', 's'],
    'parachute': ['1', 'count'],
  }
  const cal = demoCalendar(String(useRuntimeConfig().demoToday || '') || demoToday())
  for (const { entry, machine } of entries) {
    const streamlined = machine.division === 'full'
    const inspection = await startInspection(
      entry.eventId,
      { entryId: entry.id, baseId: 'electric-motorcycle' },
      scrutineer!.id,
    )
    await setFigures(inspection.id, {
      busVoltageV: 400,
      busKind: 'dc',
      declaredSpeed: streamlined ? '420' : '360',
      declaredUnit: 'km/h',
      division: machine.division, // seen as declared
    })
    for (const item of allItems(inspection.checklist)) {
      if (item.key === 'canopy-exit' && !streamlined) {
        await answerItem(inspection.id, { itemKey: item.key, result: 'na', note: 'no canopy' }, scrutineer!.id)
        continue
      }
      const [value, unit]
        = item.key === 'mass'
          ? [String(Number(machine.declaredMassKg) + 1.5), 'kg']
          : item.key === 'tyres-rated'
            ? [streamlined ? '440' : '380', 'km/h']
            : (measured[item.key] ?? [])
      await answerItem(inspection.id, { itemKey: item.key, result: 'pass', value, unit }, scrutineer!.id)
    }
    // Signed on the morning of the run day, before the first run, as on the day.
    const signedAt = new Date(localMidnight(cal.runDay, DEMO_TIME_ZONE) + 6.5 * 3600_000)
    await signInspection(inspection.id, { password: demo.password, typedName: scrutineer!.name }, scrutineer!, {
      signedAt,
    })
  }
}

/** A small invented PDF for the demo's certificates, made on the spot. */
async function demoPdf(title: string, lines: string[], made: Date) {
  const { PDFDocument, StandardFonts } = await import('pdf-lib')
  const doc = await PDFDocument.create()
  const font = await doc.embedFont(StandardFonts.Helvetica)
  const page = doc.addPage([420, 300])
  page.drawText(title, { x: 30, y: 250, size: 16, font })
  lines.forEach((l, i) => page.drawText(l, { x: 30, y: 215 - i * 18, size: 10, font }))
  const notice = 'DEMO DOCUMENT - invented for the Trapline demo; certifies nothing.'
  page.drawText(notice, { x: 30, y: 30, size: 8, font })
  doc.setCreationDate(made)
  doc.setModificationDate(made)
  return Buffer.from(await doc.save())
}

async function stage(bytes: Buffer, name: string): Promise<StagedFile> {
  const { createHash, randomUUID } = await import('node:crypto')
  const { mkdir, writeFile } = await import('node:fs/promises')
  await mkdir(uploadTmpDir(), { recursive: true })
  const path = `${uploadTmpDir()}/${randomUUID()}.part`
  await writeFile(path, bytes)
  return {
    path,
    size: bytes.length,
    sha256: createHash('sha256').update(bytes).digest('hex'),
    head: bytes.subarray(0, 4100),
    originalname: name,
  }
}

type DemoUser = typeof tables.users.$inferSelect
type CertificateKind = 'survey-certificate' | 'calibration-certificate' | 'rider-licence'

/** The demo's event, people and the streamliner's entry and attempt, as seeded. */
async function demoFacts() {
  const db = useDb()
  const user = async (email: string) => (await db.select().from(tables.users).where(eq(tables.users.email, email)))[0]!
  const [organiser, timekeeper, team, official, official2, official3, team2] = await Promise.all(
    ['organiser', 'timekeeper', 'team', 'official', 'official2', 'official3', 'team2']
      .map(r => user(`${r}@trapline.test`)),
  )
  const [event] = await db.select().from(tables.events).orderBy(tables.events.id).limit(1)
  const [course] = await db.select().from(tables.courses).where(eq(tables.courses.eventId, event!.id))
  const systems = await db.select().from(tables.timingSystems).where(eq(tables.timingSystems.eventId, event!.id))
  const [streamliner] = await db
    .select({ entry: tables.entries, rider: tables.riders })
    .from(tables.entries)
    .innerJoin(tables.riders, eq(tables.riders.id, tables.entries.riderId))
    .orderBy(tables.entries.id)
    .limit(1)
  const [attempt] = await db.select().from(tables.attempts).where(eq(tables.attempts.entryId, streamliner!.entry.id))
  const people = {
    organiser: organiser!,
    timekeeper: timekeeper!,
    team: team!,
    official: official!,
    official2: official2!,
    official3: official3!,
    team2: team2!,
  }
  /** An instant on the run day's clock, "HH:MM" in the event's zone. */
  const { runDay } = demoCalendar(String(useRuntimeConfig().demoToday || '') || demoToday())
  const onRunDay = (hhmm: string) => new Date(localToInstant(`${runDay}T${hhmm}`, event!.timeZone))
  return { people, event: event!, course: course!, systems, streamliner: streamliner!, attempt: attempt!, onRunDay }
}
type DemoFacts = Awaited<ReturnType<typeof demoFacts>>

function accessAs(facts: DemoFacts, u: DemoUser, roles: ('organiser' | 'team')[], teamIds: number[] = []) {
  return {
    user: { id: u.id, email: u.email, name: u.name, isAdmin: false },
    eventId: facts.event.id,
    roles,
    teamIds,
    asAdmin: false,
    actsAs: roles,
  }
}

/** The course survey, both calibration certificates and the rider's licence, attached as the app does. */
async function attachDemoCertificates(facts: DemoFacts) {
  const { people, event, course, systems, streamliner } = facts
  const made = new Date(`${event.startsOn}T00:00:00Z`)
  const put = async (
    who: ReturnType<typeof accessAs>,
    file: { kind: CertificateKind, name: string, title: string, lines: string[] },
    target: Record<string, number>,
  ) => {
    const pdf = await demoPdf(file.title, file.lines, made)
    return commitEvidence(who, { kind: file.kind, ...target }, await stage(pdf, file.name))
  }
  const organiser = accessAs(facts, people.organiser, ['organiser'])
  await put(organiser, {
    kind: 'survey-certificate',
    name: 'north-course-survey.pdf',
    title: 'Course survey certificate (demo)',
    lines: [
      'Tamsel Flat north course, traps M-in 3000.000 m to M-out 4609.344 m',
      `Surveyed ${addDays(event.startsOn, -13)}, tolerance 10 mm`,
    ],
  }, { courseId: course.id })
  for (const s of systems) {
    await put(organiser, {
      kind: 'calibration-certificate',
      name: `${s.name.toLowerCase().replace(/\s+/g, '-')}-calibration.pdf`,
      title: `Calibration certificate (demo): ${s.name}`,
      lines: [`Calibrated ${s.calibratedOn}, valid to ${s.calibrationExpires}`, `Resolution 1/${s.ticksPerSecond} s`],
    }, { timingSystemId: s.id })
  }
  const { rider, entry } = streamliner
  await put(accessAs(facts, people.team, ['team'], [entry.teamId]), {
    kind: 'rider-licence',
    name: 'rider-licence.pdf',
    title: 'Rider licence (demo)',
    lines: [`${rider.name}, licence ${rider.licenceNo}`, `Valid to ${rider.licenceExpires}`],
  }, { entryId: entry.id })
}

/** Two officials' signed statements on the streamliner's pair. */
async function signDemoStatements({ people, event, attempt }: DemoFacts) {
  const positions = [
    [people.official, 'beside the exit trap of the mile'],
    [people.official2, 'at the timing hut, with a view of the entry trap'],
  ] as const
  for (const [official, position] of positions) {
    const statement = {
      attemptId: attempt.id,
      runIdsSeen: [],
      runsSeen: 'both runs of the pair (out 08:05, back 08:52 local)',
      position,
      conditions: 'dry surface, light wind from the south-south-west, clear sky',
      irregularities: '',
      password: demo.password,
      typedName: official.name,
    }
    await createStatement(event.id, statement, official)
  }
}

/** The riders' briefing at 07:00 on the run day; each team signs its rider on from its own phone by 07:20. */
async function holdDemoBriefing({ people, event }: Awaited<ReturnType<typeof demoFacts>>) {
  const cal = demoCalendar(String(useRuntimeConfig().demoToday || '') || demoToday())
  const at = (hhmm: string) => new Date(localToInstant(`${cal.runDay}T${hhmm}`, event.timeZone))
  const briefing = await createBriefing(event.id, {
    title: 'Riders\' briefing, run day',
    heldAt: at('07:00').toISOString(),
    notes: 'Course layout and shut-down area, return-run window, radio channels, parachute and marshal signals.',
  }, people.organiser.id)
  const riders = await useDb().select({ id: tables.riders.id, name: tables.riders.name, teamId: tables.riders.teamId })
    .from(tables.entries).innerJoin(tables.riders, eq(tables.riders.id, tables.entries.riderId))
    .where(eq(tables.entries.eventId, event.id)).orderBy(tables.entries.id)
  for (const [i, team] of [people.team, people.team2].entries()) {
    const rider = riders[i]!
    await signOnBriefing(briefing.id, { riderId: rider.id, onDevice: 'own', typedName: rider.name,
      password: demo.password }, team, { teamIds: [rider.teamId], organiser: false }, at(`07:1${i * 5}`))
  }
}

/**
 * Once the streamliner's result is published, the second team protests its timing; the steward hears both teams
 * and the chief timekeeper, and dismisses it. The decision goes into the dossiers issued after it.
 */
async function hearDemoProtest({ people, event, attempt, onRunDay }: DemoFacts) {
  const [team2] = await useDb().select({ id: tables.teams.id }).from(tables.teams)
    .where(eq(tables.teams.name, 'Cinder Hollow Engineering'))
  const protest = await lodgeProtest(event.id, {
    attemptId: attempt.id, kind: 'timing', typedName: people.team2.name, password: demo.password,
    grounds: 'The back run\'s backup reading at the mile exit looks late against the primary; we ask that the '
      + 'pair be checked before it is published as a record.',
  }, people.team2, [team2!.id], onRunDay('09:25'))
  await decideProtest(protest.id, {
    heardAt: onRunDay('09:50').toISOString(), present: 'Both teams; the chief timekeeper', outcome: 'dismissed',
    hearing: 'The chief timekeeper showed both systems\' printouts; the backup\'s reading agrees with the primary '
      + 'within the systems\' tolerances.',
    reasons: 'The cross-check holds on both runs; nothing in the timing calls the pair into question.',
    voids: 'nothing', voidRunId: null, typedName: people.official2.name, password: demo.password,
  }, people.official2, ['official'], onRunDay('10:00'))
}

/**
 * The second team's story: the streamliner's team protests the Wisp's inspection (lodged within the half hour after it
 * was signed, on the run day's clock); the stewards hear it and uphold it: the tyres fitted were not the ones
 * inspected, so its one run is void. Its attempt shows so: no pair with that run is valid.
 */
async function upholdDemoInspectionProtest({ people, event, onRunDay }: DemoFacts) {
  const [larkspur] = await useDb().select({ id: tables.teams.id }).from(tables.teams)
    .where(eq(tables.teams.name, 'Larkspur Works'))
  const [wisp] = await useDb().select({ attempt: tables.attempts, entryId: tables.entries.id }).from(tables.attempts)
    .innerJoin(tables.entries, eq(tables.entries.id, tables.attempts.entryId))
    .innerJoin(tables.teams, eq(tables.teams.id, tables.entries.teamId))
    .where(eq(tables.teams.name, 'Cinder Hollow Engineering')).limit(1)
  const [run] = await useDb().select({ id: tables.runs.id }).from(tables.runs)
    .where(eq(tables.runs.attemptId, wisp!.attempt.id)).limit(1)
  const [inspected] = await useDb().select({ at: tables.signatures.signedAt }).from(tables.inspections)
    .innerJoin(tables.signatures, eq(tables.signatures.id, tables.inspections.signatureId))
    .where(eq(tables.inspections.entryId, wisp!.entryId))
  const protest = await lodgeProtest(event.id, {
    attemptId: wisp!.attempt.id, kind: 'inspection', typedName: people.team.name, password: demo.password,
    grounds: 'The Wisp ran on rear tyres of a lower speed rating than the pair shown at inspection; we ask that '
      + 'the tyres be checked against the inspection record.',
  }, people.team, [larkspur!.id], new Date(+inspected!.at + 10 * 60_000))
  await decideProtest(protest.id, {
    heardAt: onRunDay('10:05').toISOString(), present: 'Both teams; the chief scrutineer', outcome: 'upheld',
    hearing: 'The chief scrutineer read the sidewalls in the paddock: the rear tyre fitted for the run is not the '
      + 'one whose rating was recorded at inspection.',
    reasons: 'The machine ran on a tyre not inspected: its run is void. The machine may run again once the tyre '
      + 'fitted is inspected.',
    voids: 'run', voidRunId: run!.id, typedName: people.official2.name, password: demo.password,
  }, people.official2, ['official'], onRunDay('10:15'))
}

/**
 * The streamliner's result, confirmed by the two stewards once nothing could be protested or appealed any more: the
 * appeal period of the decision on the second team's protest (10:00, one hour) ended at 11:00 on the run day.
 */
async function confirmDemoResult({ people, attempt, onRunDay }: DemoFacts) {
  for (const [steward, at] of [[people.official2, '11:05'], [people.official3, '11:08']] as const) {
    await confirmResult(attempt.id, { typedName: steward.name, password: demo.password }, steward,
      { now: onRunDay(at), signedAt: onRunDay(at) })
  }
}

/**
 * The chief timekeeper's old laptop: a passkey registered before the season and revoked when the laptop was retired.
 * Its public key is kept (a real P-256 key, made here; it signed nothing in the demo); it signs nothing more.
 */
async function revokedDemoPasskey({ people }: DemoFacts) {
  const { publicKey } = generateKeyPairSync('ec', { namedCurve: 'P-256' })
  const jwk = publicKey.export({ format: 'jwk' }) as { x: string, y: string }
  const cose = isoCBOR.encode(new Map<number, number | Uint8Array>([
    [1, 2], [3, -7], [-1, 1], [-2, isoBase64URL.toBuffer(jwk.x)], [-3, isoBase64URL.toBuffer(jwk.y)],
  ]))
  const [key] = await useDb().insert(tables.passkeys).values({
    userId: people.timekeeper.id, credentialId: isoBase64URL.fromBuffer(randomBytes(16)),
    publicKey: isoBase64URL.fromBuffer(cose), name: 'old timing-hut laptop',
  }).returning()
  await useDb().insert(tables.passkeyRevocations)
    .values({ passkeyId: key!.id, reason: 'the laptop was retired at the end of last season' })
}

/**
 * The streamliner's team's plan for the north course's flying mile, in the run day's air: invented figures that
 * come out near what it ran (391–395 km/h each way against a record of 239.227 mph).
 */
async function saveDemoPlan({ people, streamliner }: Awaited<ReturnType<typeof demoFacts>>) {
  await savePlan({
    teamId: streamliner.entry.teamId,
    machineId: streamliner.entry.machineId,
    name: 'North course, flying mile, run-day air',
    input: {
      machine: { massKg: 366, rotatingMassKg: 25, cdA: 0.09, crr: 0.01, efficiency: 0.93,
        power: { kind: 'constant', kW: 75 }, maxTractiveN: 2200 },
      conditions: { altitudeM: 1187, temperatureC: 27.5, pressureHpa: 872.4, windMs: 2.4, windFromDeg: 200 },
      course: {
        label: 'Flying mile', lengthM: 7600, headingDeg: 172, entryM: 3000, exitM: 4609.344,
        others: [{ label: 'Flying kilometre', entryM: 3304.672, exitM: 4304.672 }],
      },
      shutdown: { decelerationMs2: 2.5, marginM: 300 },
      profileId: 'intl-motorcycle',
      recordKmh: 384.999,
      turnaroundMin: 40,
    },
  }, people.team.id)
}

/**
 * The rest of the demo day, through the same code as the app: certificates and licences attached,
 * two witness statements, the timing sheet signed, and the streamliner's dossiers (the mile and the
 * kilometre from the same pair) sealed, submitted and ratified, the mile homologated. The second
 * team's attempt stays on the way (one run, nothing signed).
 */
async function seedDemoDossier() {
  const facts = await demoFacts()
  const { people, event, attempt } = facts
  await attachDemoCertificates(facts)
  await holdDemoBriefing(facts)
  await signDemoStatements(facts)
  // Signed after the back run (08:52): the result is published, and can be protested until 09:40.
  await signTimingSheet({
    eventId: event.id,
    attemptId: attempt.id,
    userId: people.timekeeper.id,
    password: demo.password,
    typedName: people.timekeeper.name,
    signedAt: facts.onRunDay('09:10'),
  })
  await hearDemoProtest(facts)
  await upholdDemoInspectionProtest(facts)
  await confirmDemoResult(facts)
  await revokedDemoPasskey(facts)
  await saveDemoPlan(facts)
  const reasons = 'Pair within the window, timing sheet signed, both timing systems agree, machine cleared, '
    + 'two statements.'
  const decision = { decision: 'ratified' as const, reasons, password: demo.password, typedName: people.official.name }
  // One dossier per claimed distance, from the same pair of runs: the mile, then the kilometre.
  const dossiers = []
  for (const distanceId of facts.streamliner.entry.distanceIds) {
    // Issued on the run day, after the stewards' confirmation (11:08), the mile then the kilometre.
    const dossier = await issueDossier(event.id, attempt.id, people.team.id, distanceId,
      facts.onRunDay(dossiers.length ? '11:35' : '11:30'))
    await submitDossier(dossier.id, people.team.id)
    await decideDossier(dossier.id, decision, people.official)
    dossiers.push(dossier)
  }
  // The sanctioning body has since homologated the mile (an invented reference).
  await homologate(dossiers[0]!.id, {
    reference: 'DEMO-HOM-0031',
    homologatedOn: addDays(event.endsOn, -1),
    password: demo.password,
    typedName: people.official.name,
  }, people.official)
}
