// A run's time slip as a one-page PDF (handed to the team, shown at the impound).
export default defineEventHandler(async (event) => {
  const access = await requireRoleOn(event, 'run', 'any')
  const slip = await timeSlip(access)
  const pdf = await timeSlipPdf(slip)
  setHeaders(event, {
    'content-type': 'application/pdf',
    'content-disposition': `inline; filename="trapline-time-slip-run-${slip.run.id}.pdf"`,
  })
  return Buffer.from(pdf)
})
