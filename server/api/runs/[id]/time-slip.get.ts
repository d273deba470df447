// A run's time slip, for its print-ready page: a team reads its own runs' slips only.
export default defineEventHandler(async (event) => {
  const access = await requireRoleOn(event, 'run', 'any')
  return timeSlip(access)
})
