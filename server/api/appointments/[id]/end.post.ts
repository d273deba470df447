import { endAppointmentSchema } from '#shared/schemas/officials'

// The organiser ends an appointment, with the reason; it stays on record.
export default defineEventHandler(async (event) => {
  const { recordId } = await requireRoleOn(event, 'appointment', ['organiser'])
  const { reason } = await validBody(event, endAppointmentSchema)
  return endAppointment(recordId, reason)
})
