import { and, desc, eq, getTableColumns, inArray, sql } from 'drizzle-orm'
import {
  checklistMismatch,
  checkMeasurement,
  clears,
  missingItems,
  notApplicableMisused,
  notApplicableRefusal,
  toItemUnit,
  allItems,
  STORED_DECIMALS,
  UNIT_FACTORS,
  type Answer,
  type Figures,
} from '#shared/inspection/evaluate'
import { fromInput, toExactDecimal } from '#shared/rules/exact'
import { convertSpeed } from '#shared/rules/units'
import { checklistLibrary, type ChecklistId } from '#shared/inspection/templates'
import type { ChecklistTemplate } from '#shared/inspection/template'
import { massClass } from '#shared/rules/checks'
import { classesOf, findClass } from '#shared/rules/classes'
import type {
  AnswerInput,
  FiguresInput,
  ChecklistAdaptInput,
  SignRecordInput,
  StartInspectionInput,
} from '#shared/schemas/inspection'
import type { BusKind } from '#shared/constants'

const fieldError = fieldInvalid

async function loadInspection(id: number, db: Tx | Db = useDb()) {
  const [row] = await db.select().from(tables.inspections).where(eq(tables.inspections.id, id))
  if (!row) throw notFound('No such inspection')
  return row
}

/**
 * The inspection locked for a change in this transaction: answers, bus and signature are written
 * one at a time, so a signature covers exactly the content it read. A signed one is refused.
 */
async function lockUnsigned(tx: Tx, id: number) {
  const [row] = await tx.select().from(tables.inspections).where(eq(tables.inspections.id, id)).for('update')
  if (!row) throw notFound('No such inspection')
  if (row.signatureId) throw conflict('This inspection is signed; a re-inspection is a new inspection')
  return row
}

const answersOf = async (ids: number[], db: Tx | Db = useDb()) =>
  ids.length
    ? db.select().from(tables.inspectionAnswers).where(inArray(tables.inspectionAnswers.inspectionId, ids))
    : []

const asAnswers = (rows: (typeof tables.inspectionAnswers.$inferSelect)[]): Answer[] =>
  rows.map(r => ({
    itemKey: r.itemKey,
    result: r.result,
    value: r.value,
    note: r.note,
  }))

/** The organiser's adapted copy of a library checklist, with a new version for the event. */
export async function adaptChecklist(
  eventId: number,
  input: ChecklistAdaptInput,
  userId: number,
) {
  const base = checklistLibrary[input.baseId as ChecklistId]
  const known = new Set(allItems(base).map(i => i.key))
  const unknown = input.removeItems.filter(k => !known.has(k))
  if (unknown.length) throw fieldError('removeItems', `no such item: ${unknown.join(', ')}`)
  // A safety item is left out only with the rulebook article that allows it, and the copy is then used
  // only once the chief scrutineer has signed it.
  const safety = allItems(base).filter(i => i.safety && input.removeItems.includes(i.key))
  const reference = new Map(input.safetyRemovals.map(r => [r.itemKey, r.reference]))
  const unexplained = safety.filter(i => !reference.has(i.key))
  if (unexplained.length) {
    throw fieldError(
      'safetyRemovals',
      `${unexplained.map(i => i.label).join('; ')}: a safety item; name the rulebook article that allows it`,
    )
  }
  const stray = input.safetyRemovals.filter(r => !safety.some(i => i.key === r.itemKey))
  if (stray.length) {
    throw fieldError('safetyRemovals', `not a safety item left out: ${stray.map(r => r.itemKey).join(', ')}`)
  }
  const [{ n }] = (await useDb()
    .select({ n: sql<number>`count(*)::int` })
    .from(tables.checklists)
    .where(and(eq(tables.checklists.eventId, eventId), eq(tables.checklists.baseId, base.id)))) as [{ n: number }]
  const content: ChecklistTemplate = structuredClone(base)
  content.version = base.version + n + 1
  content.name = `${base.name} (adapted)`
  content.sections = content.sections.map(s => ({
    ...s,
    items: s.items.filter(i => !input.removeItems.includes(i.key)),
  }))
  if (safety.length) {
    content.removedSafetyItems = safety.map(i => ({ key: i.key, label: i.label, reference: reference.get(i.key)! }))
  }
  input.addItems.forEach((add, i) => {
    let section = content.sections.find(s => s.title === add.section)
    if (!section) {
      section = { title: add.section, items: [] }
      content.sections.push(section)
    }
    section.items.push({
      key: `added-${i + 1}`,
      label: add.label,
      kind: 'check',
      source: `added by the organiser: ${input.note}`,
      certainty: 'seen',
    })
  })
  const [row] = await useDb()
    .insert(tables.checklists)
    .values({ eventId, baseId: base.id, content, note: input.note, createdBy: userId })
    .returning()
  return row!
}

/** What a scrutineer signs in approving an adapted checklist that leaves out safety items. */
export const checklistContent = (c: typeof tables.checklists.$inferSelect) => ({
  checklist: c.id,
  event: c.eventId,
  base: c.baseId,
  version: c.content.version,
  removedSafetyItems: c.content.removedSafetyItems ?? [],
  sections: c.content.sections.map(s => ({ title: s.title, items: s.items.map(i => i.key) })),
  note: c.note,
})

/**
 * A scrutineer's signature on an adapted copy that leaves out safety items, with the rulebook articles
 * it names: the copy may be used from then on. Once only; a copy without such items needs none.
 */
export async function signChecklist(checklistId: number, input: SignRecordInput, user: { id: number }) {
  const proof = await signerProof(user.id, input)
  return useDb().transaction(async (tx) => {
    const [c] = await tx.select().from(tables.checklists).where(eq(tables.checklists.id, checklistId)).for('update')
    if (!c) throw notFound('No such checklist')
    if (!c.content.removedSafetyItems?.length) {
      throw conflict('This checklist leaves out no safety item: it needs no signature')
    }
    if (c.signatureId) throw conflict('This checklist is already signed')
    const sig = await insertSignature(tx, {
      proof,
      kind: 'checklist',
      subjectId: c.id,
      eventId: c.eventId,
      signerId: user.id,
      typedName: input.typedName,
      nameNote: input.nameNote,
      content: checklistContent(c),
      drawingPng: input.drawingPng,
    })
    await tx.update(tables.checklists).set({ signatureId: sig.id }).where(eq(tables.checklists.id, c.id))
    return { id: sig.id, sha256: sig.contentSha256, signedAt: sig.signedAt }
  })
}

export async function startInspection(
  eventId: number,
  input: StartInspectionInput,
  userId: number,
) {
  const db = useDb()
  const [entry] = await db
    .select()
    .from(tables.entries)
    .where(and(eq(tables.entries.id, input.entryId), eq(tables.entries.eventId, eventId)))
  if (!entry) throw fieldError('entryId', 'is not an entry of this event')
  let checklist: ChecklistTemplate
  if (input.checklistId) {
    const [c] = await db
      .select()
      .from(tables.checklists)
      .where(and(eq(tables.checklists.id, input.checklistId), eq(tables.checklists.eventId, eventId)))
    if (!c) throw fieldError('checklistId', 'is not a checklist of this event')
    if (c.content.removedSafetyItems?.length && !c.signatureId) {
      throw conflict('This checklist leaves out safety items: a scrutineer must sign it before it is used')
    }
    checklist = c.content
  }
  else {
    checklist = checklistLibrary[input.baseId as ChecklistId]
  }
  const [machine] = await db.select({ power: tables.machines.power }).from(tables.machines)
    .where(eq(tables.machines.id, entry.machineId))
  const mismatch = checklistMismatch(checklist, machine!.power)
  if (mismatch) throw fieldError(input.checklistId ? 'checklistId' : 'baseId', mismatch)
  return db.transaction(async (tx) => {
    // A machine is inspected once for every entry it makes: the previous inspection is the machine's.
    await tx.execute(sql`select pg_advisory_xact_lock(hashtextextended(${`machine:${entry.machineId}`}, 0))`)
    const [previous] = await tx
      .select(getTableColumns(tables.inspections))
      .from(tables.inspections)
      .innerJoin(tables.entries, eq(tables.entries.id, tables.inspections.entryId))
      .where(eq(tables.entries.machineId, entry.machineId))
      .orderBy(desc(tables.inspections.id))
      .limit(1)
    if (previous && !previous.signatureId)
      throw createError({
        statusCode: 409,
        statusMessage: 'This machine already has an inspection in progress',
        data: { inspectionId: previous.id },
      })
    const [row] = await tx
      .insert(tables.inspections)
      .values({ eventId, entryId: entry.id, checklist, previousId: previous?.id ?? null, createdBy: userId })
      .returning()
    return row!
  })
}

/** Records one item's result; a measurement is converted to the item's unit and checked. */
export async function answerItem(
  inspectionId: number,
  input: AnswerInput,
  userId: number,
) {
  return useDb().transaction(async (tx) => {
    const inspection = await lockUnsigned(tx, inspectionId)
    return writeAnswer(tx, inspection, input, userId)
  })
}

async function writeAnswer(
  tx: Tx,
  inspection: typeof tables.inspections.$inferSelect,
  input: AnswerInput,
  userId: number,
) {
  const inspectionId = inspection.id
  const item = allItems(inspection.checklist).find(i => i.key === input.itemKey)
  if (!item) throw fieldError('itemKey', 'is not an item of this checklist')
  if (input.result === 'na') {
    const refusal = notApplicableRefusal(item, inspection.division)
    if (refusal) throw fieldError('result', refusal)
    if (!input.note?.trim()) throw fieldError('note', 'say why the item does not apply to this machine')
  }
  let value: string | null = null
  if (item.kind === 'measure' && input.result !== 'na') {
    if (input.value === undefined) throw fieldError('value', `enter the measurement in ${item.unit}`)
    const unit = input.unit ?? item.unit!
    if (!(unit in (UNIT_FACTORS[item.unit!] ?? {})))
      throw fieldError('unit', `must be in ${Object.keys(UNIT_FACTORS[item.unit!] ?? {}).join(', ')}`)
    try {
      value = toItemUnit(item, input.value, unit)
    }
    catch (e) {
      throw fieldError('value', (e as Error).message)
    }
  }
  const verdict = checkMeasurement(item, value, figuresOf(inspection))
  const values = {
    inspectionId,
    itemKey: item.key,
    result: input.result,
    value,
    enteredAs: input.value === undefined ? null : `${input.value} ${input.unit ?? item.unit}`,
    note: input.note ?? null,
    updatedBy: userId,
    updatedAt: new Date(),
  }
  const [row] = await tx
    .insert(tables.inspectionAnswers)
    .values(values)
    .onConflictDoUpdate({
      target: [tables.inspectionAnswers.inspectionId, tables.inspectionAnswers.itemKey],
      set: values,
    })
    .returning()
  return { answer: row!, verdict }
}

/**
 * Sets the working voltage and bus kind, the declared top speed (stored in km/h, exactly), or the division seen.
 */
export async function setFigures(inspectionId: number, input: FiguresInput) {
  const set: Partial<typeof tables.inspections.$inferInsert> = {}
  if (input.busVoltageV !== undefined) {
    set.busVoltageV = String(input.busVoltageV)
    set.busKind = input.busKind
  }
  if (input.declaredSpeed !== undefined) {
    const kmh = convertSpeed(fromInput(input.declaredSpeed), input.declaredUnit, 'km/h')
    set.declaredKmh = toExactDecimal(kmh, STORED_DECIMALS)
  }
  if (input.division !== undefined) set.division = input.division
  return useDb().transaction(async (tx) => {
    await lockUnsigned(tx, inspectionId)
    const [row] = await tx
      .update(tables.inspections)
      .set(set)
      .where(eq(tables.inspections.id, inspectionId))
      .returning()
    return row!
  })
}

/** The canonical content an inspection signature covers. */
export async function inspectionContent(inspectionId: number, db: Tx | Db = useDb()) {
  const inspection = await loadInspection(inspectionId, db)
  const [entry] = await db
    .select({ entry: tables.entries, machine: tables.machines, rider: tables.riders, team: tables.teams.name })
    .from(tables.entries)
    .innerJoin(tables.machines, eq(tables.machines.id, tables.entries.machineId))
    .innerJoin(tables.riders, eq(tables.riders.id, tables.entries.riderId))
    .innerJoin(tables.teams, eq(tables.teams.id, tables.entries.teamId))
    .where(eq(tables.entries.id, inspection.entryId))
  const answers = (await answersOf([inspectionId], db)).sort((a, b) => a.itemKey.localeCompare(b.itemKey))
  return {
    inspection: inspection.id,
    previous: inspection.previousId,
    entry: {
      id: entry!.entry.id,
      team: entry!.team,
      machine: entry!.machine.name,
      power: entry!.machine.power,
      declaredMassKg: entry!.machine.declaredMassKg,
      rider: entry!.rider.name,
      className: entry!.entry.className,
    },
    checklist: inspection.checklist,
    bus: { voltageV: inspection.busVoltageV, kind: inspection.busKind },
    ...(inspection.declaredKmh === null ? {} : { declaredKmh: inspection.declaredKmh }),
    // Added later: present only where confirmed, so an inspection signed before still hashes as signed.
    ...(inspection.division === null ? {} : { division: inspection.division }),
    answers: answers.map(a => ({
      item: a.itemKey,
      result: a.result,
      value: a.value,
      enteredAs: a.enteredAs,
      note: a.note,
    })),
  }
}

export async function signInspection(
  inspectionId: number,
  input: SignRecordInput,
  user: { id: number },
  demo: { signedAt?: Date } = {},
) {
  const [of] = await useDb().select({ eventId: tables.inspections.eventId, teamId: tables.entries.teamId })
    .from(tables.inspections).innerJoin(tables.entries, eq(tables.entries.id, tables.inspections.entryId))
    .where(eq(tables.inspections.id, inspectionId))
  if (of) {
    await refuseConflicted(useDb(), { eventId: of.eventId, userId: user.id }, [of.teamId],
      'sign the inspection of this team\'s machine')
  }
  const proof = await signerProof(user.id, input)
  return useDb().transaction(async (tx) => {
    // The content is read under the same row lock as the signature: what is signed is what is stored.
    const inspection = await lockUnsigned(tx, inspectionId)
    const missing = missingItems(inspection.checklist, asAnswers(await answersOf([inspectionId], tx)))
    if (missing.length) {
      throw createError({
        statusCode: 422,
        statusMessage: 'Invalid input',
        message: `items: not answered: ${missing.map(m => m.label).join('; ')}`,
        data: {
          issues: [{ path: 'items', message: `not answered: ${missing.map(m => m.label).join('; ')}` }],
          missing: missing.map(m => m.key),
        },
      })
    }
    const division = await divisionOf(inspection, tx)
    if (division.classGoesBy && !inspection.division) {
      const why = `confirm the streamlining division you see: the class (${division.className}) goes by it`
      throw fieldInvalid('division', why)
    }
    const answers = asAnswers(await answersOf([inspectionId], tx))
    const misused = notApplicableMisused(inspection.checklist, answers, inspection.division)
    if (misused.length) throw fieldInvalid('items', `marked not applicable: ${misused.join('; ')}`)
    const content = await inspectionContent(inspectionId, tx)
    const sig = await insertSignature(tx, {
      proof,
      kind: 'inspection',
      subjectId: inspectionId,
      eventId: inspection.eventId,
      signerId: user.id,
      typedName: input.typedName,
      nameNote: input.nameNote,
      content,
      drawingPng: input.drawingPng,
      signedAt: demo.signedAt,
    })
    await tx.update(tables.inspections).set({ signatureId: sig.id }).where(eq(tables.inspections.id, inspectionId))
    return { id: sig.id, sha256: sig.contentSha256, signedAt: sig.signedAt }
  })
}

/**
 * The division the team declared for the inspected machine, and the division its class goes by (null where the
 * class does not go by one): the scrutineer confirms what is seen where the class goes by it.
 */
async function divisionOf(inspection: Pick<typeof tables.inspections.$inferSelect, 'entryId'>, db: Tx | Db = useDb()) {
  const [row] = await db
    .select({ declared: tables.machines.division, className: tables.entries.className, profile: tables.events.profile })
    .from(tables.entries)
    .innerJoin(tables.machines, eq(tables.machines.id, tables.entries.machineId))
    .innerJoin(tables.events, eq(tables.events.id, tables.entries.eventId))
    .where(eq(tables.entries.id, inspection.entryId))
  return {
    declared: row!.declared,
    className: row!.className,
    classGoesBy: findClass(classesOf(row!.profile), row!.className)?.division ?? null,
  }
}

type Clearance = { cleared: boolean, why: string, inspectionId: number | null }

/** Every inspection, signature time, suspension and answer of some machines, read once. */
async function machineRecords(machineIds: number[]) {
  const { entries, inspections, machineSuspensions } = tables
  const all = machineIds.length
    ? await useDb()
        .select({ machineId: entries.machineId, ins: getTableColumns(inspections) })
        .from(inspections)
        .innerJoin(entries, eq(entries.id, inspections.entryId))
        .where(inArray(entries.machineId, machineIds))
        .orderBy(desc(inspections.id))
    : []
  const suspensions = machineIds.length
    ? await useDb().select().from(machineSuspensions).where(inArray(machineSuspensions.machineId, machineIds))
    : []
  const signedAt = await signedTimes(all.map(l => l.ins.signatureId).filter((x): x is number => !!x))
  const answers = await answersOf(all.map(l => l.ins.id))
  return { all, suspensions, signedAt, answers }
}
type MachineRecords = Awaited<ReturnType<typeof machineRecords>>

/**
 * Whether a machine may run at an instant (or now, when `at` is null): the inspection in force (now: the
 * latest, signed or not; at an instant: the latest signed before it), signed, every item passed and every
 * measurement within its limit, and no suspension of the machine between its signature and the instant.
 */
function clearanceIn(r: MachineRecords, machineId: number, at: Date | null): Clearance {
  const signed = (i: { signatureId: number | null }) => (i.signatureId ? r.signedAt.get(i.signatureId) : undefined)
  const ins = r.all
    .filter(l => l.machineId === machineId)
    .map(l => l.ins)
    .filter(i => at === null || (signed(i) !== undefined && signed(i)! <= at))
    .sort((a, b) => (at === null ? b.id - a.id : signed(b)!.getTime() - signed(a)!.getTime()))[0]
  if (!ins) {
    return {
      cleared: false,
      why: at === null ? 'no technical inspection yet' : 'no signed inspection before the run started',
      inspectionId: null,
    }
  }
  const since = signed(ins)
  const suspended = r.suspensions
    .filter(s => s.machineId === machineId && (!since || s.createdAt >= since) && (!at || s.createdAt <= at))
    .at(-1)
  if (suspended) {
    return {
      cleared: false,
      why: `the machine is suspended: ${suspended.reason}; a new inspection clears it`,
      inspectionId: ins.id,
    }
  }
  const theirs = asAnswers(r.answers.filter(a => a.inspectionId === ins.id))
  return { ...clears(ins.checklist, theirs, !!ins.signatureId, figuresOf(ins)), inspectionId: ins.id }
}

const machinesOf = async (entryIds: number[]) =>
  entryIds.length
    ? useDb().select({ id: tables.entries.id, machineId: tables.entries.machineId }).from(tables.entries)
        .where(inArray(tables.entries.id, entryIds))
    : []

/**
 * Whether each entry may run now: its machine's latest inspection (one clears the machine for every entry
 * it makes at the event), signed and passed, and no suspension since (see `clearanceIn`).
 */
export async function clearanceOf(entryIds: number[]) {
  const out = new Map<number, Clearance>()
  const mine = await machinesOf(entryIds)
  const records = await machineRecords([...new Set(mine.map(e => e.machineId))])
  for (const e of mine) out.set(e.id, clearanceIn(records, e.machineId, null))
  return out
}

/** The inspection in force when each run started, and whether it cleared the machine then. */
export async function clearanceAtRuns(entryId: number, runs: { id: number, startedAt: string | Date }[]) {
  const [mine] = await machinesOf([entryId])
  if (!mine) throw notFound('No such entry')
  const records = await machineRecords([mine.machineId])
  return runs.map(run => ({ runId: run.id, ...clearanceIn(records, mine.machineId, new Date(run.startedAt)) }))
}

async function signedTimes(ids: number[]) {
  if (!ids.length) return new Map<number, Date>()
  const rows = await useDb().select({ id: tables.signatures.id, at: tables.signatures.signedAt })
    .from(tables.signatures).where(inArray(tables.signatures.id, ids))
  return new Map(rows.map(r => [r.id, r.at]))
}

/** An inspection with its checklist, answers, the checks of every measurement and the clearance. */
export async function inspectionView(inspectionId: number) {
  const inspection = await loadInspection(inspectionId)
  const answers = await answersOf([inspectionId])
  const figures = figuresOf(inspection)
  const [event] = await useDb()
    .select({ profile: tables.events.profile })
    .from(tables.events)
    .where(eq(tables.events.id, inspection.eventId))
  const mass = answers.find(a => a.itemKey === 'mass')
  const klass = mass?.value ? massClass(event!.profile.massClasses.value, Number(mass.value)) : null
  const signature = inspection.signatureId
    ? (
        await useDb()
          .select({
            id: tables.signatures.id,
            typedName: tables.signatures.typedName,
            method: tables.signatures.method,
            at: tables.signatures.signedAt,
            sha256: tables.signatures.contentSha256,
            by: tables.users.name,
          })
          .from(tables.signatures)
          .innerJoin(tables.users, eq(tables.users.id, tables.signatures.signerId))
          .where(eq(tables.signatures.id, inspection.signatureId))
      )[0]
    : null
  const clearance = clears(inspection.checklist, asAnswers(answers), !!inspection.signatureId, figures)
  // A re-inspection shows the previous inspection's values, item by item, for the scrutineer to confirm.
  const previous = inspection.previousId ? await answersOf([inspection.previousId]) : []
  const { declared, classGoesBy } = await divisionOf(inspection)
  return {
    inspection,
    /** The division the team declared, and the one its class goes by (the scrutineer confirms what is seen). */
    division: { declared, classGoesBy },
    previousAnswers: previous.map(a => ({
      itemKey: a.itemKey, result: a.result, enteredAs: a.enteredAs, note: a.note,
    })),
    answers: answers.map(a => ({
      ...a,
      verdict: checkMeasurement(
        allItems(inspection.checklist).find(i => i.key === a.itemKey)!,
        a.value,
        figures,
      ),
    })),
    missing: missingItems(inspection.checklist, asAnswers(answers)).map(i => i.key),
    massClass: klass?.label ?? null,
    massClassNote: event!.profile.massClasses.value
      ? null
      : `the profile in force defines no mass classes (${event!.profile.massClasses.source})`,
    signature,
    clearance,
  }
}

/** What an inspection measured against: its working voltage and bus kind, and the declared speed. */
export function figuresOf(
  inspection: Pick<typeof tables.inspections.$inferSelect, 'busVoltageV' | 'busKind' | 'declaredKmh'>,
): Figures {
  return {
    busVoltageV: inspection.busVoltageV,
    busKind: inspection.busKind as BusKind | null,
    declaredKmh: inspection.declaredKmh,
  }
}
