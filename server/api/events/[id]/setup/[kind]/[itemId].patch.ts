import { setupCorrectionSchemas, setupItemParams } from '#shared/schemas/setup-corrections'

// The organiser corrects a trap, measured distance, timing system or standing record, with a reason kept in the
// set-up history; refused once a signed timing sheet rests on it.
export default defineEventHandler(async (event) => {
  const { eventId, user } = await requireEventRole(event, ['organiser'])
  const { kind, itemId } = validParams(event, setupItemParams)
  const { reason, ...values } = await validBody(event, setupCorrectionSchemas[kind])
  return correctSetupItem(eventId, kind, itemId, values, reason, user.id)
})
