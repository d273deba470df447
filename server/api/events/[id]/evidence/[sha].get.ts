import { hashParams } from '#shared/schemas/evidence'

// Evidence by its SHA-256 within one event; another event's file answers 404 even for the same hash.
export default defineEventHandler(async (event) => {
  const access = await requireEventRole(event, 'any', { admin: true })
  const { sha } = validParams(event, hashParams)
  return findEvidence(access, { sha256: sha })
})
