// A passkey signs (or reopens) the timing sheet as it stands now: the server issues a random,
// single-use challenge over the SHA-256 of that content, for this signer and this act.
export default defineEventHandler(async (event) => {
  const { recordId, eventId, user } = await requireRoleOn(event, 'attempt', ['timekeeper'])
  const content = timingSheetContent(await loadEventDay(eventId, { history: true }), recordId)
  return signingOptions(user.id, 'timing-sheet', passkeyDigest('timing-sheet', content))
})
