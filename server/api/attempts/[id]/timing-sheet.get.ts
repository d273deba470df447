// The printable timing sheet: its canonical content now, and each signature with whether the
// content it signed still hashes to what was stored.
export default defineEventHandler(async (event) => {
  const access = await requireRoleOn(event, 'attempt', 'any')
  const { recordId, eventId } = access
  // A team reads its own attempts' timing sheets, as it reads their signatures and dossiers.
  await assertOwnAttempt(access, recordId)
  const day = await loadEventDay(eventId, { history: true })
  const content = timingSheetContent(day, recordId)
  const nowHash = sha256(canonicalJson(content))
  const stored = await signedContents(day.signatures.filter(x => x.s.subjectId === recordId).map(x => x.s.id))
  const signatures = day.signatures
    .filter(x => x.s.subjectId === recordId)
    .map(x => ({
      id: x.s.id,
      kind: x.s.kind,
      by: x.signerName,
      typedName: x.s.typedName,
      at: x.s.signedAt,
      reason: x.s.reason,
      sha256: x.s.contentSha256,
      storedContentMatches: sha256(canonicalJson(stored.get(x.s.id))) === x.s.contentSha256,
      matchesCurrent: x.s.contentSha256 === nowHash,
    }))
  return { content, sha256: nowHash, signatures, sheet: sheetState(day, recordId) }
})
