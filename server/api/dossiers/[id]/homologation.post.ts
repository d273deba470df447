import { homologationSchema } from '#shared/schemas/inspection'

// An official enters the sanctioning body's homologation of a ratified record: reference and date, signed.
export default defineEventHandler(async (event) => {
  const { recordId, user } = await requireRoleOn(event, 'dossier', ['official'])
  const input = await validBody(event, homologationSchema)
  const row = await homologate(recordId, input, user)
  setResponseStatus(event, 201)
  return row
})
