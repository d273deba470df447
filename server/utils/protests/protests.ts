import { and, asc, desc, eq, inArray, isNull } from 'drizzle-orm'
import { clockTime, deadlineAfter, PROTEST_KIND_LABELS, type ProtestRule } from '#shared/rules/protests'
import type { AppealInput, ProtestDecisionInput, ProtestInput } from '#shared/schemas/protests'

type ProtestRow = typeof tables.protests.$inferSelect

/** The attempt with its event and the protest rule of its frozen profile (the event's where the copy has none). */
async function attemptOf(eventId: number, attemptId: number) {
  const [row] = await useDb().select({ attempt: tables.attempts, event: tables.events, entry: tables.entries })
    .from(tables.attempts)
    .innerJoin(tables.events, eq(tables.events.id, tables.attempts.eventId))
    .innerJoin(tables.entries, eq(tables.entries.id, tables.attempts.entryId))
    .where(and(eq(tables.attempts.id, attemptId), eq(tables.attempts.eventId, eventId)))
  if (!row) throw fieldInvalid('attemptId', 'is not an attempt of this event')
  const rule: ProtestRule | undefined = row.attempt.profile.protests?.value ?? row.event.profile.protests?.value
  if (!rule) throw conflict('The rule profile of this attempt provides no protests')
  return { ...row, rule }
}

/**
 * When what a protest is against was published: the result, a timing decision or another entry's result
 * when the attempt's timing sheet was signed; an inspection decision when the entry's inspection was signed.
 */
async function publishedAt(kind: ProtestInput['kind'], attemptId: number, entryId: number) {
  if (kind === 'inspection') {
    const [s] = await useDb().select({ at: tables.signatures.signedAt }).from(tables.inspections)
      .innerJoin(tables.signatures, eq(tables.signatures.id, tables.inspections.signatureId))
      .where(eq(tables.inspections.entryId, entryId)).orderBy(desc(tables.signatures.signedAt)).limit(1)
    if (!s) throw conflict('No inspection of this entry is signed yet: nothing to protest')
    return s.at
  }
  const [s] = await useDb().select({ at: tables.signatures.signedAt }).from(tables.signatures)
    .where(and(eq(tables.signatures.kind, 'timing-sheet'), eq(tables.signatures.subjectId, attemptId)))
    .orderBy(desc(tables.signatures.signedAt)).limit(1)
  if (!s) throw conflict('This attempt\'s result is not published yet: it is, once its timing sheet is signed')
  return s.at
}

/** The people appointed stewards, to be told of a protest. */
const stewardEmails = async (eventId: number) => (await useDb().select({ email: tables.users.email })
  .from(tables.appointments).innerJoin(tables.users, eq(tables.users.id, tables.appointments.userId))
  .where(and(eq(tables.appointments.eventId, eventId), eq(tables.appointments.function, 'steward'),
    isNull(tables.appointments.endedAt)))).map(r => r.email)

/** The people of these teams at the event, to be told of a protest that concerns them and of its decision. */
const teamEmails = async (eventId: number, teamIds: number[]) => [...new Set((await useDb()
  .select({ email: tables.users.email })
  .from(tables.memberships).innerJoin(tables.users, eq(tables.users.id, tables.memberships.userId))
  .where(and(eq(tables.memberships.eventId, eventId), eq(tables.memberships.role, 'team'),
    inArray(tables.memberships.teamId, teamIds.length ? teamIds : [0])))).map(r => r.email))]

async function insertSigned(values: typeof tables.protests.$inferInsert, input: ProtestInput | AppealInput,
  user: { id: number }, proof: SignerProof, guard: (tx: Tx) => Promise<void> = async () => {}, signedAt?: Date) {
  return useDb().transaction(async (tx) => {
    await guard(tx)
    const [row] = await tx.insert(tables.protests).values(values).returning()
    const content = {
      eventId: row!.eventId, protest: row!.id, appealOf: row!.appealOf, attemptId: row!.attemptId, kind: row!.kind,
      grounds: row!.grounds, teamId: row!.teamId, deadline: row!.deadline.toISOString(), feeNote: row!.feeNote,
    }
    const signature = await insertSignature(tx, {
      proof, kind: 'protest', subjectId: row!.id, eventId: row!.eventId, signerId: user.id,
      typedName: input.typedName, nameNote: input.nameNote, content, signedAt,
    })
    const [signed] = await tx.update(tables.protests).set({ signatureId: signature.id })
      .where(eq(tables.protests.id, row!.id)).returning()
    return signed!
  })
}

/**
 * A team lodges a protest within the profile's deadline after what it protests was published, counted in the
 * event's zone; a protest too late is refused with the deadline as the event's clock showed it.
 */
export async function lodgeProtest(eventId: number, input: ProtestInput, user: { id: number }, teamIds: number[],
  seededAt?: Date) {
  // The demo's seed lodges on its own calendar, and its signature says so; otherwise now.
  const now = seededAt ?? new Date()
  const { attempt, event, entry, rule } = await attemptOf(eventId, input.attemptId)
  const teamId = teamIds[0]
  if (teamId === undefined) throw forbidden('Only a team of the event lodges a protest')
  if (input.kind === 'entry' && teamIds.includes(entry.teamId)) {
    throw fieldInvalid('kind', 'a protest against another entry names another team\'s attempt')
  }
  const published = await publishedAt(input.kind, attempt.id, entry.id)
  const deadline = new Date(deadlineAfter(+published, rule.lodge, event.timeZone))
  if (now > deadline) {
    throw conflict(`Too late: protests against this were due by ${clockTime(+deadline, event.timeZone)} `
      + `(published ${clockTime(+published, event.timeZone)}); nothing was lodged`, { deadline })
  }
  const proof = await signerProof(user.id, input)
  const row = await insertSigned({
    eventId, attemptId: attempt.id, kind: input.kind, grounds: input.grounds, teamId, lodgedBy: user.id,
    lodgedAt: now, publishedAt: published, deadline, feeNote: rule.fee,
  }, input, user, proof, undefined, seededAt)
  const text = `${PROTEST_KIND_LABELS[input.kind]}, lodged ${clockTime(+now, event.timeZone)}.\n\n${input.grounds}\n`
  // The stewards who hear it, and the team whose attempt it concerns (when that is another team; not for the demo's
  // seeded past).
  const protested = entry.teamId === teamId || seededAt ? [] : await teamEmails(eventId, [entry.teamId])
  const subject = `Protest lodged: attempt #${attempt.id} (${event.name})`
  await queueMail([
    ...(await stewardEmails(eventId)).map(to => ({ to, subject, text })),
    ...protested.map(to => ({ to, subject: `A protest concerns your attempt #${attempt.id} (${event.name})`,
      text: `${text}\nThe stewards hear it; their decision is mailed to you.\n` })),
  ], { wait: false })
  return row
}

/** A party to a decided protest (the team that lodged it, or the team of the attempt) appeals within the deadline. */
export async function lodgeAppeal(protestId: number, input: AppealInput, user: { id: number }, teamIds: number[],
  now = new Date()) {
  const [protest] = await useDb().select().from(tables.protests).where(eq(tables.protests.id, protestId))
  if (!protest) throw notFound('No such protest')
  if (protest.appealOf) throw conflict('An appeal\'s decision is not appealed here')
  if (!protest.decidedAt) throw conflict('The stewards have not decided this protest yet')
  const { event, entry, rule } = await attemptOf(protest.eventId, protest.attemptId)
  if (!rule.appeal) throw conflict('The rule profile provides no appeal')
  const party = [protest.teamId, entry.teamId].find(t => teamIds.includes(t))
  if (party === undefined) throw forbidden('Only a party to the protest may appeal')
  const deadline = new Date(deadlineAfter(+protest.decidedAt, rule.appeal.deadline, event.timeZone))
  if (now > deadline) {
    throw conflict(`Too late: an appeal was due by ${clockTime(+deadline, event.timeZone)}; nothing was lodged`,
      { deadline })
  }
  const proof = await signerProof(user.id, input)
  return insertSigned({
    eventId: protest.eventId, attemptId: protest.attemptId, appealOf: protest.id, kind: protest.kind,
    grounds: input.grounds, teamId: party, lodgedBy: user.id, lodgedAt: now, publishedAt: protest.decidedAt,
    deadline, feeNote: null,
  }, input, user, proof, async (tx) => {
    // One appeal per decision: checked under a lock on the protest, so appeals sent together are one.
    await tx.select({ id: tables.protests.id }).from(tables.protests).where(eq(tables.protests.id, protestId))
      .for('update')
    const [already] = await tx.select({ id: tables.protests.id }).from(tables.protests)
      .where(eq(tables.protests.appealOf, protestId))
    if (already) throw conflict('This decision is already under appeal')
  })
}

/**
 * The hearing and the decision with reasons, signed once. A protest is decided by a steward appointed at the
 * event; an appeal's decision (taken by the appeal body) is recorded by an official of the event.
 */
export async function decideProtest(protestId: number, input: ProtestDecisionInput, user: { id: number },
  roles: string[], at?: Date) {
  const [found] = await useDb().select().from(tables.protests).where(eq(tables.protests.id, protestId))
  if (!found) throw notFound('No such protest')
  // Who may decide comes before the password: a person not allowed is told so, not asked to sign.
  if (found.appealOf && !roles.includes('official')) {
    throw forbidden('An official records the appeal body\'s decision')
  }
  if (!found.appealOf && !(await holdsAppointment(found.eventId, user.id, 'steward'))) {
    throw forbidden('Only a steward appointed at this event decides a protest')
  }
  // Neither the team protested against nor the team that protested may judge it.
  await refuseConflicted(useDb(), { eventId: found.eventId, userId: user.id },
    [await teamOfAttemptIn(useDb(), found.attemptId), found.teamId],
    `decide ${found.appealOf ? 'an appeal' : 'a protest'} that concerns this team`)
  const proof = await signerProof(user.id, input)
  return useDb().transaction(async (tx) => {
    const [locked] = await tx.select().from(tables.protests).where(eq(tables.protests.id, protestId)).for('update')
    const p = locked!
    if (p.decidedAt) throw conflict(`This ${p.appealOf ? 'appeal' : 'protest'} is already decided`)
    if (input.voidRunId !== null) {
      const [run] = await tx.select({ id: tables.runs.id }).from(tables.runs)
        .where(and(eq(tables.runs.id, input.voidRunId), eq(tables.runs.attemptId, p.attemptId)))
      if (!run) throw fieldInvalid('voidRunId', 'is not a run of the attempt protested')
    }
    // The demo's seed decides on its own calendar (`at`); otherwise now.
    const decidedAt = at ?? new Date()
    const decision = {
      heardAt: new Date(input.heardAt), present: input.present, hearing: input.hearing, outcome: input.outcome,
      reasons: input.reasons, decidedBy: user.id, decidedAt, voids: input.voids, voidRunId: input.voidRunId,
    }
    const content = {
      eventId: p.eventId, protest: p.id, appealOf: p.appealOf, attemptId: p.attemptId, grounds: p.grounds,
      heardAt: input.heardAt, present: input.present, hearing: input.hearing, outcome: input.outcome,
      reasons: input.reasons, voids: input.voids, voidRunId: input.voidRunId,
    }
    const signature = await insertSignature(tx, {
      proof, kind: 'protest-decision', subjectId: p.id, eventId: p.eventId, signerId: user.id,
      typedName: input.typedName, nameNote: input.nameNote, content, signedAt: at,
    })
    const [row] = await tx.update(tables.protests).set({ ...decision, decisionSignatureId: signature.id })
      .where(and(eq(tables.protests.id, p.id), isNull(tables.protests.decidedAt))).returning()
    return row!
  }).then(async (row) => {
    // The demo's seeded decisions (`at`) are its past: nobody is mailed them.
    if (!at) await mailDecision(row, await teamOfAttemptIn(useDb(), row.attemptId))
    return row
  })
}

/** The decision, mailed to the team that lodged it and the team whose attempt it concerns. */
async function mailDecision(p: typeof tables.protests.$inferSelect, attemptTeamId: number) {
  const [event] = await useDb().select({ name: tables.events.name, timeZone: tables.events.timeZone })
    .from(tables.events).where(eq(tables.events.id, p.eventId))
  const what = p.appealOf ? `Appeal #${p.id} on protest #${p.appealOf}` : `Protest #${p.id}`
  const consequence = p.voids === 'result'
    ? 'The attempt\'s result is void.'
    : p.voids === 'run' ? `Run #${p.voidRunId} is void.` : 'Nothing is made void.'
  const text = `${what} on attempt #${p.attemptId}: ${p.outcome}, ${clockTime(+p.decidedAt!, event!.timeZone)}. `
    + `${consequence}\n\nReasons: ${p.reasons}\n`
  await queueMail((await teamEmails(p.eventId, [p.teamId, attemptTeamId])).map(to => ({
    to, subject: `${what} decided: ${p.outcome} (${event!.name})`, text,
  })), { wait: false })
}

/** Protests and appeals on these attempts (or the whole event), oldest first, with names and clock times. */
export async function protestsOf(eventId: number, attemptIds?: number[]) {
  const where = attemptIds
    ? and(eq(tables.protests.eventId, eventId),
        inArray(tables.protests.attemptId, attemptIds.length ? attemptIds : [0]))
    : eq(tables.protests.eventId, eventId)
  const rows = await useDb().select({ p: tables.protests, team: tables.teams.name, by: tables.users.name })
    .from(tables.protests)
    .innerJoin(tables.teams, eq(tables.teams.id, tables.protests.teamId))
    .innerJoin(tables.users, eq(tables.users.id, tables.protests.lodgedBy))
    .where(where).orderBy(asc(tables.protests.id))
  const deciders = await namesOf(rows.flatMap(r => (r.p.decidedBy ? [r.p.decidedBy] : [])))
  const [event] = await useDb().select({ timeZone: tables.events.timeZone, profile: tables.events.profile })
    .from(tables.events).where(eq(tables.events.id, eventId))
  const appealRule = event!.profile.protests?.value.appeal ?? null
  const zone = event!.timeZone
  return rows.map(({ p, team, by }) => ({
    ...p,
    team,
    lodgedByName: by,
    decidedByName: p.decidedBy ? deciders.get(p.decidedBy) ?? null : null,
    kindLabel: PROTEST_KIND_LABELS[p.kind],
    open: !p.decidedAt,
    deadlineClock: clockTime(+p.deadline, zone),
    lodgedClock: clockTime(+p.lodgedAt, zone),
    decidedClock: p.decidedAt ? clockTime(+p.decidedAt, zone) : null,
    /** Until when the decision may be appealed, where the profile gives an appeal and this is not one. */
    appealBy: p.decidedAt && !p.appealOf && appealRule
      ? clockTime(deadlineAfter(+p.decidedAt, appealRule.deadline, zone), zone)
      : null,
    appealTo: !p.appealOf ? appealRule?.to ?? null : null,
  }))
}

async function namesOf(ids: number[]) {
  if (!ids.length) return new Map<number, string>()
  const rows = await useDb().select({ id: tables.users.id, name: tables.users.name }).from(tables.users)
    .where(inArray(tables.users.id, ids))
  return new Map(rows.map(r => [r.id, r.name]))
}

/** The protests or appeals not yet decided on each attempt: while one is, no dossier is issued or ratified. */
export async function openProtestsOn(attemptIds: number[], db: Tx | Db = useDb()) {
  if (!attemptIds.length) return [] as ProtestRow[]
  return db.select().from(tables.protests)
    .where(and(inArray(tables.protests.attemptId, attemptIds), isNull(tables.protests.decidedAt)))
}
