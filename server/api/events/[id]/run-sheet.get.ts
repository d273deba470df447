// The timekeeper's sheet: every reading with its corrections, newest state computed.
export default defineEventHandler(async (event) => {
  const { eventId } = await requireEventRole(event, ['timekeeper', 'organiser', 'official'])
  const day = await loadEventDay(eventId, { history: true })
  return {
    now: new Date().toISOString(),
    timeZone: day.event.timeZone,
    attempts: computeLive(day, { readings: true }),
    history: day.readings.map(r => ({ ...r, ticks: r.ticks.toString() })),
    entries: day.entries.map(e => ({
      id: e.entry.id,
      teamName: e.teamName,
      machineName: e.machine.name,
      riderName: e.rider.name,
      className: e.entry.className,
      distanceId: e.entry.distanceId,
      /** What its claims take: flying passes, standing starts, or either (claims of both kinds). */
      starts: [...new Set(e.entry.distanceIds.map(id => day.distances.find(d => d.id === id)!.start))],
    })),
    traps: day.traps,
    systems: day.systems,
    /** How each timing system's own file reads, where one was set. */
    deviceLayouts: await deviceLayoutsOf(day.systems.map(s => s.id)),
  }
})
