// What the dossier of this attempt still needs, each item with where to fix it.
export default defineEventHandler(async (event) => {
  const access = await requireRoleOn(event, 'attempt', 'any')
  await assertOwnAttempt(access, access.recordId)
  const r = await readinessOf(access.eventId, access.recordId)
  return { attemptId: r.attemptId, ready: r.ready, items: r.items, result: r.live.result, entry: r.live.entry }
})
