// The timekeeper's sheet: every reading with its corrections, newest state computed.
export default defineEventHandler(async (event) => {
  const { eventId, user } = await requireEventRole(event, ['timekeeper', 'organiser', 'official'])
  const day = await loadEventDay(eventId, { history: true })
  // The server's clock (a test server may be given the instant a test asks about).
  const now = (testClock(event) ?? new Date()).getTime()
  const attempts = computeLive(day, { readings: true })
  const clearance = await clearanceOf(day.entries.map(e => e.entry.id))
  // The attempts as computed above (their windows and findings): not computed a second time.
  const placements = placementsOf(day, now, attempts)
  const startLine = await startLineOf(useDb(), day.event, day.entries, new Date(now), undefined,
    reachedBefore(day, attempts, now))
  /** A run of the entry that left the line and has neither a time nor an abort yet. */
  const openRun = (entryId: number) => attempts.filter(a => a.entry.id === entryId)
    .flatMap(a => a.runs).find(r => r.status !== 'aborted' && !r.official)?.id ?? null
  return {
    now: new Date(now).toISOString(),
    timeZone: day.event.timeZone,
    attempts,
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
      /** Whether it may run now (a signed, passed inspection and no suspension since), and if not why. */
      cleared: clearance.get(e.entry.id)?.cleared ?? false,
      notClearedWhy: clearance.get(e.entry.id)?.why ?? null,
      openRunId: openRun(e.entry.id),
      /** Where a run out or back leaving now would go: the open attempt, or a new one and why. */
      next: placements.get(e.entry.id)!,
      /** What the start line says now: licence, grade, medical, briefing, and the clerk's override of the day. */
      startLine: startLine.get(e.entry.id)!,
    })),
    /** Whether the person reading is the clerk of the course, who alone overrides the start line. */
    clerk: await isClerkOfCourse(eventId, user.id),
    traps: day.traps,
    systems: day.systems,
    /** How each timing system's own file reads, where one was set. */
    deviceLayouts: await deviceLayoutsOf(day.systems.map(s => s.id)),
  }
})
