// A passkey signs (or reopens) the timing sheet as it stands now: the challenge is its content's SHA-256.
export default defineEventHandler(async (event) => {
  const { recordId, eventId, user } = await requireRoleOn(event, 'attempt', ['timekeeper'])
  const content = timingSheetContent(await loadEventDay(eventId, { history: true }), recordId)
  return signingOptions(user.id, passkeyDigest('timing-sheet', content))
})
