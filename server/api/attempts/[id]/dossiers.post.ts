import { claimedDistanceSchema } from '#shared/schemas/event-day'

// Builds and seals a new dossier version for one claimed distance (by default the first); refused,
// naming what is missing, while not ready.
export default defineEventHandler(async (event) => {
  const access = await requireRoleOn(event, 'attempt', ['team', 'organiser'])
  await assertOwnAttempt(access, access.recordId)
  const { distanceId } = await validBody(event, claimedDistanceSchema)
  const row = await issueDossier(access.eventId, access.recordId, access.user.id, distanceId)
  setResponseStatus(event, 201)
  return {
    id: row.id,
    version: row.version,
    distanceId: row.distanceId,
    manifestSha256: row.manifestSha256,
    pdfSha256: row.pdfSha256,
    pdfSize: row.pdfSize,
    keyFingerprint: row.keyFingerprint,
  }
})
