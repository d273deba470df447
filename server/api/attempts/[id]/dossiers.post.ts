// Builds and seals a new dossier version; refused, naming what is missing, while not ready.
export default defineEventHandler(async (event) => {
  const access = await requireRoleOn(event, 'attempt', ['team', 'organiser'])
  await assertOwnAttempt(access, access.recordId)
  const row = await issueDossier(access.eventId, access.recordId, access.user.id)
  setResponseStatus(event, 201)
  return {
    id: row.id,
    version: row.version,
    manifestSha256: row.manifestSha256,
    pdfSha256: row.pdfSha256,
    pdfSize: row.pdfSize,
    keyFingerprint: row.keyFingerprint,
  }
})
