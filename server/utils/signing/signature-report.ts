import { eq } from 'drizzle-orm'

/** A signature with the checks of its content: as stored, and as the record is now. */
export async function signatureReport(signatureId: number) {
  const [row] = await useDb()
    .select({ s: tables.signatures, by: tables.users.name, email: tables.users.email })
    .from(tables.signatures)
    .innerJoin(tables.users, eq(tables.users.id, tables.signatures.signerId))
    .where(eq(tables.signatures.id, signatureId))
  if (!row) throw notFound('No such signature')
  const s = row.s
  let current: unknown
  let teamId = 0
  let title = ''
  if (s.kind === 'inspection') {
    current = await inspectionContent(s.subjectId)
    const [e] = await useDb()
      .select({ teamId: tables.entries.teamId })
      .from(tables.inspections)
      .innerJoin(tables.entries, eq(tables.entries.id, tables.inspections.entryId))
      .where(eq(tables.inspections.id, s.subjectId))
    teamId = e!.teamId
    title = `Technical inspection #${s.subjectId}`
  }
  else if (s.kind === 'statement') {
    const [st] = await useDb()
      .select({ s: tables.statements, author: tables.users.name })
      .from(tables.statements)
      .innerJoin(tables.users, eq(tables.users.id, tables.statements.authorId))
      .where(eq(tables.statements.id, s.subjectId))
    current = statementContent(st!.s, st!.author)
    teamId = await teamOfAttempt(st!.s.attemptId)
    title = st!.s.withdrawsId
      ? `Withdrawal of witness statement #${st!.s.withdrawsId}`
      : `Witness statement #${s.subjectId}`
  }
  else if (s.kind === 'set-aside') {
    const [x] = await useDb()
      .select({ s: tables.setAsides, official: tables.users.name })
      .from(tables.setAsides)
      .innerJoin(tables.users, eq(tables.users.id, tables.setAsides.officialId))
      .where(eq(tables.setAsides.id, s.subjectId))
    current = setAsideContent(x!.s, x!.official)
    teamId = await teamOfAttempt(x!.s.attemptId)
    title = `Set-aside of finding ${x!.s.code} on attempt #${x!.s.attemptId}`
  }
  else if (s.kind === 'suspension') {
    const [x] = await useDb()
      .select({ s: tables.machineSuspensions, by: tables.users.name, teamId: tables.machines.teamId })
      .from(tables.machineSuspensions)
      .innerJoin(tables.users, eq(tables.users.id, tables.machineSuspensions.scrutineerId))
      .innerJoin(tables.machines, eq(tables.machines.id, tables.machineSuspensions.machineId))
      .where(eq(tables.machineSuspensions.id, s.subjectId))
    current = suspensionContent(x!.s, x!.by)
    teamId = x!.teamId
    title = `Suspension of machine #${x!.s.machineId}`
  }
  else if (s.kind === 'post-run-check') {
    const [x] = await useDb()
      .select({ c: tables.postRunChecks, by: tables.users.name })
      .from(tables.postRunChecks)
      .innerJoin(tables.users, eq(tables.users.id, tables.postRunChecks.scrutineerId))
      .where(eq(tables.postRunChecks.id, s.subjectId))
    current = postRunCheckContent(x!.c, x!.by)
    teamId = await teamOfAttempt(x!.c.attemptId)
    title = `Post-run check of attempt #${x!.c.attemptId}`
  }
  else if (s.kind === 'homologation') {
    const [x] = await useDb()
      .select({ h: tables.homologations, by: tables.users.name, d: tables.dossiers })
      .from(tables.homologations)
      .innerJoin(tables.users, eq(tables.users.id, tables.homologations.officialId))
      .innerJoin(tables.dossiers, eq(tables.dossiers.id, tables.homologations.dossierId))
      .where(eq(tables.homologations.id, s.subjectId))
    current = homologationContent(x!.h, x!.by, x!.d.pdfSha256)
    teamId = await teamOfAttempt(x!.d.attemptId)
    title = `Homologation of dossier #${x!.d.id} (${x!.h.reference})`
  }
  else if (s.kind === 'notice') {
    const [n] = await useDb().select().from(tables.notices).where(eq(tables.notices.id, s.subjectId))
    current = n ? { eventId: n.eventId, notice: n.id, attemptId: n.attemptId, title: n.title, body: n.body } : null
    teamId = n?.attemptId ? await teamOfAttempt(n.attemptId) : 0
    title = `Official notice #${s.subjectId}: ${n?.title ?? ''}`
  }
  else if (s.kind === 'checklist') {
    const [c] = await useDb().select().from(tables.checklists).where(eq(tables.checklists.id, s.subjectId))
    current = checklistContent(c!)
    title = `Adapted checklist #${s.subjectId}, leaving out safety items`
  }
  else if (s.kind === 'ratification') {
    const [x] = await useDb()
      .select({ d: tables.dossiers, decision: tables.decisions })
      .from(tables.dossiers)
      .innerJoin(tables.decisions, eq(tables.decisions.dossierId, tables.dossiers.id))
      .where(eq(tables.dossiers.id, s.subjectId))
    current = x ? decisionContent(x.d, x.decision) : null
    teamId = await teamOfAttempt(x?.d.attemptId ?? 0)
    title = `Decision on dossier #${s.subjectId}`
  }
  else if (s.kind === 'revocation') {
    const [x] = await useDb()
      .select({ r: tables.claimRevocations, d: tables.dossiers, decision: tables.decisions })
      .from(tables.claimRevocations)
      .innerJoin(tables.dossiers, eq(tables.dossiers.id, tables.claimRevocations.dossierId))
      .innerJoin(tables.decisions, eq(tables.decisions.dossierId, tables.dossiers.id))
      .where(eq(tables.claimRevocations.id, s.subjectId))
    current = x ? revocationContent(x.d, x.decision.id, x.r.reason) : null
    teamId = await teamOfAttempt(x?.d.attemptId ?? 0)
    title = `Revocation of the ratification of dossier #${x?.d.id ?? '?'}`
  }
  else if (s.kind === 'confirmation') {
    current = await confirmationContentNow(s.eventId, s.subjectId)
    teamId = await teamOfAttempt(s.subjectId)
    title = `The stewards' confirmation of the result of attempt #${s.subjectId}`
  }
  else {
    current = timingSheetContent(await loadEventDay(s.eventId, { history: true }), s.subjectId)
    teamId = await teamOfAttempt(s.subjectId)
    title = `${s.kind === 'timing-sheet' ? 'Timing sheet' : 'Reopening of the timing sheet'} of attempt #${s.subjectId}`
  }
  return {
    id: s.id,
    kind: s.kind,
    title,
    subjectId: s.subjectId,
    signedBy: row.by,
    typedName: s.typedName,
    signedAt: s.signedAt,
    reason: s.reason,
    drawingPng: s.drawingPng,
    sha256: s.contentSha256,
    content: s.content,
    teamId,
    storedContentMatches: sha256(canonicalJson(s.content)) === s.contentSha256,
    /** How the signer proved it was them; for a passkey, whether its assertion still holds over the content. */
    method: s.method,
    assertion: s.assertion,
    passkeyHolds: s.assertion ? await assertionHolds(s.kind, s.content, s.assertion) : null,
    recordStillMatches: sha256(canonicalJson(current)) === s.contentSha256,
  }
}

const teamOfAttempt = async (attemptId: number) => (await findTeamOfAttempt(useDb(), attemptId)) ?? 0
