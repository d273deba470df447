import { eq } from 'drizzle-orm'

// The receipt of a paid fee: for its team and the organiser.
export default defineEventHandler(async (event) => {
  const access = await requireRoleOn(event, 'payment', ['team', 'organiser'])
  const [row] = await useDb().select({ p: tables.payments, event: tables.events.name, team: tables.teams.name,
    teamId: tables.teams.id, machine: tables.machines.name })
    .from(tables.payments)
    .innerJoin(tables.events, eq(tables.events.id, tables.payments.eventId))
    .innerJoin(tables.entries, eq(tables.entries.id, tables.payments.entryId))
    .innerJoin(tables.teams, eq(tables.teams.id, tables.entries.teamId))
    .innerJoin(tables.machines, eq(tables.machines.id, tables.entries.machineId))
    .where(eq(tables.payments.id, access.recordId))
  if (!row || (actsAsTeamOnly(access) && !access.teamIds.includes(row.teamId))) throw notFound('No such payment')
  if (row.p.status !== 'paid') throw conflict('This fee is not paid: there is no receipt')
  const bytes = await receiptPdf(row.p, row)
  setHeaders(event, {
    'content-type': 'application/pdf',
    'content-disposition': `inline; filename="receipt-${row.p.receiptNo}.pdf"`,
  })
  return bytes
})
