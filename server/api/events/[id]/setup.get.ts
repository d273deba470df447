import { checkMeasuredDistance } from '#shared/rules/course'

export default defineEventHandler(async (event) => {
  const { eventId } = await requireEventRole(event, 'any', { admin: true })
  const day = await loadEventDay(eventId)
  // Why each item may not be corrected any more (a signed timing sheet rests on it); null where it may.
  const locks = await setupLocks(eventId, [
    ...day.traps.map(row => ({ kind: 'traps' as const, row })),
    ...day.distances.map(row => ({ kind: 'distances' as const, row })),
    ...day.systems.map(row => ({ kind: 'timing-systems' as const, row })),
    ...day.records.filter(r => !r.dossierId).map(row => ({ kind: 'records' as const, row })),
  ])
  return {
    locks,
    history: await setupHistoryOf(eventId),
    event: day.event,
    courses: day.courses.map(c => ({ ...c, traps: day.traps.filter(t => t.courseId === c.id) })),
    distances: day.distances.map((d) => {
      const course = day.courses.find(c => c.id === d.courseId)!
      const trap = (id: number) => day.traps.find(t => t.id === id)!
      return {
        ...d,
        check: checkMeasuredDistance(
          day.event.profile,
          trap(d.entryTrapId),
          trap(d.exitTrapId),
          d.nominalM,
          course.surveyToleranceMm,
        ),
      }
    }),
    systems: day.systems,
    records: day.records,
    entries: day.entries.map(e => ({
      ...e.entry,
      teamName: e.teamName,
      machineName: e.machine.name,
      riderName: e.rider.name,
    })),
  }
})
