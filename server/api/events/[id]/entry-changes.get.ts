// The entries' details as they stand, whether each has run, the change requests and the history of
// corrections: a team sees its own entries, the organiser every entry.
export default defineEventHandler(async (event) => {
  const access = await requireEventRole(event, ['team', 'organiser'])
  const day = await loadEventDay(access.eventId)
  const organiser = access.actsAs.includes('organiser')
  const entries = day.entries.filter(e => organiser || access.teamIds.includes(e.entry.teamId))
  const ids = entries.map(e => e.entry.id)
  const ran = await entriesThatRan(ids)
  const { requests, history } = await entryChangesOf(access.eventId, ids)
  return {
    organiser,
    entries: entries.map(e => ({
      id: e.entry.id,
      teamName: e.teamName,
      hasRun: ran.has(e.entry.id),
      /** The rider and machine rows, which other entries may share. */
      riderId: e.entry.riderId,
      machineId: e.entry.machineId,
      rider: {
        name: e.rider.name, licenceNo: e.rider.licenceNo, licenceExpires: e.rider.licenceExpires,
        licenceGrade: e.rider.licenceGrade, medicalExpires: e.rider.medicalExpires,
      },
      machine: {
        name: e.machine.name,
        power: e.machine.power,
        declaredMassKg: e.machine.declaredMassKg,
        division: e.machine.division,
      },
    })),
    requests,
    history,
  }
})
