import { figuresSchema } from '#shared/schemas/inspection'

// The figures measurements are judged against: the high-voltage bus and the declared top speed.
export default defineEventHandler(async (event) => {
  const { recordId } = await requireRoleOn(event, 'inspection', ['scrutineer'])
  const input = await validBody(event, figuresSchema)
  return setFigures(recordId, input)
})
