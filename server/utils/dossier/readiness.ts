import { and, eq, inArray } from 'drizzle-orm'
import { localDate } from '#shared/rules/zoned'
import { blocks, mayBeSetAside, setAsideQuorum, setAsideRule } from '#shared/rules/findings'
import { stewardsQuorum } from '#shared/rules/profile'
import { massClass } from '#shared/rules/checks'
import { classesOf, classProblems, figureProblems, findClass, type Division } from '#shared/rules/classes'
import { fromDecimal, sub, toFixed } from '#shared/rules/exact'
import { OFFICIAL_FUNCTION_LABELS } from '#shared/constants'

export interface ReadinessItem {
  key: string
  label: string
  met: boolean
  detail: string
  fix: string
  /**
   * For a failing finding: which, whether the stewards may still set it aside, and their decision awaiting
   * signatures (the names so far, the reason, how many sign in all).
   */
  finding?: {
    code: string
    runId: number | null
    setAsideable: boolean
    /** Who may set it aside: the stewards together, or the chief timekeeper alone. */
    authority: 'never' | 'stewards' | 'chief-timekeeper'
    pending: { id: number, signers: string[], reason: string, quorum: number } | null
  }
}

/** Everything an attempt's file for one claimed distance (by default its first) is judged on, read once. */
async function loadAttemptFile(eventId: number, attemptId: number, distanceId: number | undefined, now: Date) {
  const day = await loadEventDay(eventId, { history: true })
  const attempt = day.attempts.find(a => a.id === attemptId)
  if (!attempt) throw notFound('No such attempt')
  const live = computeLive({ ...day, attempts: [attempt] }, { distanceId })[0]!
  if (distanceId !== undefined && live.entry.distanceId !== distanceId) {
    const claimed = live.distances.map(d => d.label).join(', ')
    throw fieldInvalid('distanceId', `is not a distance this attempt claims (${claimed})`)
  }
  const entry = day.entries.find(e => e.entry.id === attempt.entryId)!
  const counted = live.runs.filter(r => r.counted)
  const statements = (await statementsAt(eventId, null)).filter(
    s => s.attemptId === attemptId && !s.withdrawsId && !s.withdrawnBy,
  )
  return {
    attemptId,
    attempt,
    at: `/events/${eventId}`,
    day,
    live,
    entry,
    distance: day.distances.find(d => d.id === live.entry.distanceId)!,
    counted,
    runDays: counted.map(r => localDate(Date.parse(r.startedAt), day.event.timeZone)),
    evidence: await useDb().select().from(tables.evidence).where(eq(tables.evidence.eventId, eventId)),
    statements,
    officials: await officialsOf(eventId, attempt.profile.appointments?.value ?? []),
    openProtests: await openProtestsOn([attemptId]),
    confirmation: await confirmationOf({
      eventId, attemptId, entryId: attempt.entryId, profile: attempt.profile, timeZone: day.event.timeZone,
      sheet: sheetInForce(live.sheet),
    }, now),
    ...(await clearancesWithSigners(entry.entry.id, counted)),
  }
}

/** The clearances, and who signed each inspection the file rests on (and when). */
async function clearancesWithSigners(entryId: number, counted: { id: number, startedAt: string }[]) {
  const c = await clearances(entryId, counted)
  const ids = [...new Set([...c.atRuns.map(a => a.inspectionId), c.clearance.inspectionId]
    .filter((i): i is number => typeof i === 'number'))]
  const inspectionSigners = ids.length
    ? await useDb().select({ inspectionId: tables.signatures.subjectId, id: tables.signatures.signerId,
        at: tables.signatures.signedAt, name: tables.users.name })
        .from(tables.signatures).innerJoin(tables.users, eq(tables.users.id, tables.signatures.signerId))
        .where(and(eq(tables.signatures.kind, 'inspection'), inArray(tables.signatures.subjectId, ids)))
    : []
  return { ...c, inspectionSigners }
}

/**
 * The inspection in force at the start of each counted run, and what the file is judged on: every
 * counted run started on a machine cleared then (before any run, the machine's clearance now).
 */
async function clearances(entryId: number, counted: { id: number, startedAt: string }[]) {
  const atRuns = await clearanceAtRuns(entryId, counted)
  if (!atRuns.length) return { atRuns, clearance: (await clearanceOf([entryId])).get(entryId)! }
  const failing = atRuns.filter(c => !c.cleared)
  const ids = [...new Set(atRuns.map(c => c.inspectionId))]
  return {
    atRuns,
    clearance: {
      cleared: !failing.length,
      why: failing.length
        ? failing.map(c => `run #${c.runId}: ${c.why}`).join('; ')
        : `inspection ${ids.map(i => `#${i}`).join(', ')} in force and clearing the machine at each counted run`,
      inspectionId: atRuns.at(-1)!.inspectionId,
    },
  }
}
type AttemptFile = Awaited<ReturnType<typeof loadAttemptFile>>

/**
 * Where the profile appoints a chief timekeeper or chief scrutineer and someone is appointed, the sheet and the
 * clearance are theirs: the signer held that appointment when signing (recorded before or after, not ended before
 * the signature).
 */
function chiefSigned(file: AttemptFile, fn: 'chief-timekeeper' | 'chief-scrutineer', signer: { id: number, at: Date }) {
  if (!(file.attempt.profile.appointments?.value ?? []).includes(fn)) return true
  // Nobody appointed yet: the appointments item says the function is vacant; this one judges the signer once it is.
  const held = file.officials.appointments.filter(a => a.function === fn)
  return !held.length || held.some(a => a.userId === signer.id && (!a.endedAt || a.endedAt > signer.at))
}

/** The records made on the day: the pair, the signed timing sheet, the inspection, the statements. */
function recordItems(file: AttemptFile): ReadinessItem[] {
  const { at, day, live, counted, clearance, statements, attempt, officials, openProtests } = file
  const sheetSigner = day.signatures
    .filter(x => x.s.subjectId === attempt.id && x.s.kind.startsWith('timing-sheet')).at(-1)?.s
  const sheetByChief = !sheetSigner
    || chiefSigned(file, 'chief-timekeeper', { id: sheetSigner.signerId, at: sheetSigner.signedAt })
  const notChiefScrutineer = file.inspectionSigners.filter(s => !chiefSigned(file, 'chief-scrutineer', s))
  // The dossier is issued on figures somebody signed: the sheet's content now must hash as signed.
  const sheetUnchanged = live.sheet.locked
    && sha256(canonicalJson(timingSheetContent(day, attempt.id))) === live.sheet.latest?.sha256
  const needed = attempt.profile.witnessStatements.value
  // Witnesses are people: a statement counts once per official.
  const witnesses = new Set(statements.map(s => s.authorId)).size
  return [
    {
      key: 'pair',
      label: 'A complete pair of runs under the profile',
      fix: `${at}/live`,
      met: !!live.result && counted.length === 2,
      // The window is the profile's rule, said as a rule ("within …"), never beside the figure as if measured.
      detail: live.result
        ? `${live.result.kmh} km/h; the pair is ${live.window?.ok === false ? 'outside' : 'within'} its time window `
        + `(the rule: ${live.window?.rule})`
        : `${counted.length} complete run(s) so far`,
    },
    {
      key: 'timing-sheet',
      label: 'The signed timing sheet, unchanged since it was signed',
      fix: `${at}/run-sheet`,
      met: live.sheet.locked && sheetUnchanged && sheetByChief,
      detail: !live.sheet.locked
        ? 'not signed'
        : !sheetUnchanged
            ? 'what the timing sheet holds now differs from what was signed: reopen it and sign it again'
            : sheetByChief
              ? `signed by ${live.sheet.latest?.typedName}`
              : `signed by ${live.sheet.latest?.typedName}, who was not the appointed chief timekeeper: reopen it and `
                + 'have the chief timekeeper sign it',
    },
    {
      key: 'inspection',
      label: 'A signed inspection that cleared the machine before each counted run',
      fix: `${at}/inspections`,
      met: clearance.cleared && !notChiefScrutineer.length,
      detail: notChiefScrutineer.length
        ? `inspection ${notChiefScrutineer.map(s => `#${s.inspectionId}`).join(', ')} was signed by `
        + `${notChiefScrutineer.map(s => s.name).join(', ')}, not the appointed chief scrutineer: the chief `
        + 'scrutineer signs a new inspection'
        : clearance.why,
    },
    {
      key: 'statements',
      label: `Signed witness statements of ${needed} distinct official(s)`,
      fix: `${at}/statements`,
      met: witnesses >= needed,
      detail: `${witnesses} official(s) with a signed statement that stands`,
    },
    // Functions the attempt's profile requires someone to hold (none in copies frozen before appointments).
    ...((attempt.profile.appointments?.value.length ?? 0) > 0
      ? [{
          key: 'appointments',
          label: 'Officials appointed to every function the profile requires',
          fix: `${at}/people`,
          met: officials.missing.length === 0,
          detail: officials.missing.length
            ? `nobody holds: ${officials.missing.map(f => OFFICIAL_FUNCTION_LABELS[f].toLowerCase()).join(', ')}`
            : officials.appointments.filter(a => !a.endedAt).map(a => `${a.label}: ${a.name}`).join('; '),
        }]
      : []),
    {
      key: 'protests',
      label: 'No protest or appeal open on the attempt',
      fix: `${at}/protests`,
      met: openProtests.length === 0,
      detail: openProtests.length
        ? `open: ${openProtests.map(p => `${p.appealOf ? 'appeal' : 'protest'} #${p.id}`).join(', ')}; the stewards `
        + 'decide first, and the decision goes into the dossier'
        : 'none open',
    },
  ]
}

/**
 * Where the profile names stewards, their confirmation of the result: the quorum's signatures on the timing sheet in
 * force, given only after the protest and appeal periods and every protest decided (see confirmResult).
 */
function confirmationItems({ attemptId, confirmation: c }: AttemptFile): ReadinessItem[] {
  if (!c.required) return []
  const names = c.signers.map(s => s.name).join(' and ')
  const stewards = c.quorum === 1 ? 'an appointed steward signs' : `${c.quorum} appointed stewards sign`
  return [{
    key: 'confirmation',
    label: 'The stewards\' confirmation of the result, after the protest and appeal periods',
    fix: `/attempts/${attemptId}/dossier#confirmation`,
    met: c.confirmed,
    detail: c.confirmed
      ? `confirmed by ${names}`
      : c.signers.length
        ? `confirmed by ${names}; ${c.quorum - c.signers.length} more steward(s) to sign`
        : c.waits.length
          ? `not yet: ${c.waits.join('; ')}; then ${stewards} it`
          : `${stewards} it now`,
  }]
}

/** Where a finding is resolved, by what it is about. */
function findingFix(at: string, code: string, attemptId: number) {
  if (code.startsWith('timing.') || code.startsWith('reading.') || code.startsWith('wind.')) return `${at}/run-sheet`
  if (code.startsWith('course.')) return `${at}/setup`
  if (code.startsWith('rider.')) return `${at}/entries`
  if (mayBeSetAside({ code, severity: 'fail' })) return `/attempts/${attemptId}/dossier#set-aside`
  return `${at}/live`
}

/**
 * Each failing finding of the attempt and of its counted runs, one item each: it blocks the dossier
 * until it is resolved where it arose, or the appointed stewards set it aside
 * with a signed, written reason (where the finding is theirs to set aside at all).
 */
function findingItems({ at, live, counted, attemptId, attempt, day }: AttemptFile): ReadinessItem[] {
  const all = [
    ...live.findings.map(f => ({ f, runId: null as number | null })),
    ...counted.flatMap(r => r.findings.map(f => ({ f, runId: r.id as number | null }))),
  // The machine against its class is its own item (classItems), with the inspection in force at the end.
  ].filter(({ f }) => f.severity === 'fail' && !f.code.startsWith('class.'))
  const stewardsNeeded = stewardsQuorum(attempt.profile)
  return all.map(({ f, runId }) => {
    const rule = setAsideRule(f.code)
    const quorum = setAsideQuorum(f.code, stewardsNeeded)
    const byChief = rule.authority === 'chief-timekeeper'
    const who = byChief ? 'the chief timekeeper' : 'the stewards'
    const sets = byChief
      ? 'the appointed chief timekeeper sets'
      : quorum === 1 ? 'an appointed steward sets' : `${quorum} appointed stewards set`
    const awaiting = day.setAsides.filter(s => s.attemptId === attemptId && s.signers.length < quorum)
    const proposed = f.setAside ? undefined : awaiting.find(s => s.code === f.code && s.runId === runId)
    const pending = proposed
      ? { id: proposed.id, signers: proposed.signers, reason: proposed.reason, quorum }
      : null
    return {
      key: `finding-${f.code}-${runId ?? 'attempt'}`,
      label: `${runId ? `Run #${runId}` : 'The attempt'}: ${f.message}`,
      fix: findingFix(at, f.code, attemptId),
      met: !blocks(f),
      detail: f.setAside
        ? `set aside by ${who} (${f.setAside.by}): ${f.setAside.reason}`
        : pending
          ? `the stewards' decision to set it aside is signed by ${pending.signers.join(' and ')}; it takes effect `
          + `once ${quorum} stewards have signed (${quorum - pending.signers.length} more): ${pending.reason}`
          : mayBeSetAside(f)
            ? `blocks the dossier until it is resolved, or ${sets} it aside with a signed, written reason`
            : `blocks the dossier, and can never be set aside: ${rule.why}`,
      finding: {
        code: f.code, runId, setAsideable: mayBeSetAside(f) && !f.setAside, authority: rule.authority, pending,
      },
    }
  })
}

/**
 * Where the profile asks for it, the machine's signed check after the record run, its mass compared
 * with the mass of the inspection in force: a machine that weighs into another mass class after the run
 * than at its inspection does not meet it; nor one outside its record class on the figures re-measured (mass,
 * capacity), nor one whose impound seals were found broken.
 */
async function postRunItems({ attempt, attemptId, clearance, entry }: AttemptFile): Promise<ReadinessItem[]> {
  if (!attempt.profile.postRunCheck?.value) return []
  const [check] = await useDb().select().from(tables.postRunChecks)
    .where(eq(tables.postRunChecks.attemptId, attemptId))
  const item = {
    key: 'post-run-check',
    label: 'The signed post-run check of the machine (mass re-measured)',
    fix: `/attempts/${attemptId}/dossier`, // a scrutineer records it on this page
  }
  if (!check) return [{ ...item, met: false, detail: 'not recorded' }]
  const c = findClass(classesOf(attempt.profile), entry.entry.className)
  const rejudged = c ? figureProblems(c, { massKg: check.massKg, capacityCm3: check.capacityCm3 }) : []
  const seals = check.sealNumbers.length
    ? `seals ${check.sealNumbers.join(', ')} ${check.sealsIntact ? 'intact' : 'found broken'}`
    : 'no seal recorded'
  const inspected = clearance.inspectionId ? await inspectedMassKg(clearance.inspectionId) : null
  const classes = attempt.profile.massClasses.value
  const before = inspected === null ? null : massClass(classes, Number(inspected))
  const after = check.massKg === null ? null : massClass(classes, Number(check.massKg))
  const moved = !!before && !!after && before.label !== after.label
  const compared = inspected === null || check.massKg === null
    ? 'no inspected mass to compare'
    : `inspected ${inspected} kg, difference ${toFixed(sub(fromDecimal(check.massKg), fromDecimal(inspected)), 1)} kg`
      + (moved ? `: now in mass class ${after!.label}, inspected in ${before!.label}` : '')
  const capacity = check.capacityCm3 === null ? '' : `, ${check.capacityCm3} cm³`
  const outside = rejudged.length ? `; outside the class ${c!.label} after the run: ${rejudged.join('; ')}` : ''
  const remark = check.note || 'no remark'
  return [{
    ...item,
    met: !!check.signatureId && !moved && !rejudged.length && check.sealsIntact !== false,
    detail: `${check.massKg} kg${capacity} after the run, ${compared}${outside}; ${seals}; ${remark}`,
  }]
}

const inspectedMassKg = (inspectionId: number) => inspectedValue(inspectionId, 'mass')

async function inspectedValue(inspectionId: number, itemKey: string) {
  const [row] = await useDb().select({ value: tables.inspectionAnswers.value }).from(tables.inspectionAnswers)
    .where(and(eq(tables.inspectionAnswers.inspectionId, inspectionId), eq(tables.inspectionAnswers.itemKey, itemKey)))
  return row?.value ?? null
}

/**
 * The machine against the class its entry claims: propulsion as entered, division as the scrutineer saw it, mass
 * and capacity as measured at the inspection in force, side by side with the class's limits. A profile that lists no
 * classes (a copy frozen before classes were data) asks nothing here.
 */
async function classItems(file: AttemptFile): Promise<ReadinessItem[]> {
  const { attempt, entry, clearance, at } = file
  const classes = classesOf(attempt.profile)
  if (!classes.length) return []
  const item = { key: 'class', label: `The machine fits its class (${entry.entry.className})`, fix: `${at}/entries` }
  const c = findClass(classes, entry.entry.className)
  if (!c) return [{ ...item, met: false, detail: 'the class is not one of the profile\'s classes' }]
  const measured = async (key: string) => (clearance.inspectionId ? inspectedValue(clearance.inspectionId, key) : null)
  const [seen] = clearance.inspectionId
    ? await useDb().select({ division: tables.inspections.division }).from(tables.inspections)
        .where(eq(tables.inspections.id, clearance.inspectionId))
    : []
  const problems = classProblems(c, {
    power: entry.machine.power,
    // The division the scrutineer saw; the entry's on an inspection from before divisions were confirmed.
    division: seen?.division ?? (entry.machine.division as Division | null) ?? null,
    massKg: await measured('mass'),
    capacityCm3: await measured('engine-capacity'),
  })
  return [{
    ...item,
    met: !problems.length,
    detail: problems.length ? problems.join('; ') : 'propulsion, division, mass and capacity within the class',
  }, ...scaleItems(file, !!c.massKg)]
}

/**
 * Where the class goes by mass, the mass was weighed on a certified scale: the scale's certificate is
 * attached to the inspection in force (domain notes: mass measured on a calibrated scale, with the
 * scale's certificate as evidence).
 */
function scaleItems({ clearance, evidence, at }: AttemptFile, byMass: boolean): ReadinessItem[] {
  if (!byMass) return []
  const id = clearance.inspectionId
  const cert = id ? evidence.find(e => e.kind === 'scale-certificate' && e.inspectionId === id) : undefined
  return [{
    key: 'scale',
    label: 'The class goes by mass: the certificate of the scale it was weighed on',
    fix: id ? `${at}/evidence?kind=scale-certificate&target=inspectionId:${id}` : `${at}/inspections`,
    met: !!cert,
    detail: cert ? `${cert.originalName}, on inspection #${id}` : `none attached to inspection #${id ?? '—'}`,
  }]
}

/** The course survey and each timing system's calibration, valid on the days of the runs. */
function equipmentItems({ at, day, distance, evidence, runDays }: AttemptFile): ReadinessItem[] {
  const survey = evidence.find(e => e.kind === 'survey-certificate' && e.courseId === distance.courseId)
  const items: ReadinessItem[] = [{
    key: 'survey',
    label: 'The course survey certificate',
    fix: `${at}/evidence?kind=survey-certificate&target=courseId:${distance.courseId}`,
    met: !!survey,
    detail: survey ? survey.originalName : 'not attached to the course',
  }]
  for (const s of day.systems) {
    const cert = evidence.find(e => e.kind === 'calibration-certificate' && e.timingSystemId === s.id)
    const valid = runDays.every(d => d >= s.calibratedOn && d <= s.calibrationExpires)
    items.push({
      key: `calibration-${s.role}`,
      label: `Calibration certificate of the ${s.role} timing system, valid on the day`,
      fix: `${at}/evidence?kind=calibration-certificate&target=timingSystemId:${s.id}`,
      met: !!cert && valid,
      detail: `${cert ? cert.originalName : 'no certificate attached'}; calibrated ${s.calibratedOn} to `
        + `${s.calibrationExpires}${valid ? '' : ', not valid on the day of the runs'}`,
    })
  }
  if (day.systems.length < 2) {
    items.push({
      key: 'calibration-backup',
      label: 'A primary and a backup timing system',
      fix: `${at}/setup`,
      met: false,
      detail: `${day.systems.length} timing system(s) set up`,
    })
  }
  return items
}

/** The weather at each counted run and the rider's licence, valid on the days of the runs. */
function runAndRiderItems({ at, counted, entry, evidence, runDays }: AttemptFile): ReadinessItem[] {
  const noWeather = counted.filter(r => !r.weather)
  const licence = evidence.find(e => e.kind === 'rider-licence' && e.entryId === entry.entry.id)
  const licenceValid = runDays.every(d => d <= entry.rider.licenceExpires)
  return [
    {
      key: 'weather',
      label: 'Weather at each run',
      fix: `${at}/run-sheet`,
      met: counted.length > 0 && noWeather.length === 0,
      detail: noWeather.length ? `missing for run(s) ${noWeather.map(r => `#${r.id}`).join(', ')}` : 'recorded',
    },
    {
      key: 'licence',
      label: 'The rider\'s licence',
      fix: `${at}/evidence?kind=rider-licence&target=entryId:${entry.entry.id}`,
      met: !!licence && licenceValid,
      detail: `${licence ? licence.originalName : 'no licence attached'}; ${entry.rider.licenceNo}, expires `
        + `${entry.rider.licenceExpires}${licenceValid ? '' : ', before the runs'}`,
    },
  ]
}

/**
 * What a dossier needs, each item met or missing, with where to fix it. Built from the same data
 * and engine as the live results.
 */
export async function readinessOf(eventId: number, attemptId: number, distanceId?: number, now = new Date()) {
  const file = await loadAttemptFile(eventId, attemptId, distanceId, now)
  const items = [
    ...recordItems(file),
    ...confirmationItems(file),
    ...findingItems(file),
    ...equipmentItems(file),
    ...runAndRiderItems(file),
    ...(await postRunItems(file)),
    ...(await classItems(file)),
  ]
  const { live, day, entry, distance, evidence, statements, clearance, atRuns, confirmation } = file
  const ready = items.every(i => i.met)
  return { attemptId, ready, items, live, day, entry, distance, evidence, statements, clearance, atRuns, confirmation }
}

export async function attemptOfEvent(eventId: number, attemptId: number) {
  const [a] = await useDb()
    .select()
    .from(tables.attempts)
    .where(and(eq(tables.attempts.id, attemptId), eq(tables.attempts.eventId, eventId)))
  if (!a) throw notFound('No such attempt')
  return a
}

/** Everything known about an attempt's file: the day, the live result, and what is still missing. */
export type Readiness = Awaited<ReturnType<typeof readinessOf>>
