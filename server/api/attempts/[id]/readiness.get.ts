import { claimedDistanceSchema } from '#shared/schemas/event-day'

// What the dossier of this attempt (for one claimed distance) still needs, each item with where to fix it.
export default defineEventHandler(async (event) => {
  const access = await requireRoleOn(event, 'attempt', 'any')
  await assertOwnAttempt(access, access.recordId)
  const { distanceId } = validQuery(event, claimedDistanceSchema)
  const r = await readinessOf(access.eventId, access.recordId, distanceId, testClock(event))
  return {
    attemptId: r.attemptId,
    distanceId: r.distance.id,
    ready: r.ready,
    timeZone: r.day.event.timeZone,
    items: r.items,
    /** Whether the person asking is a steward appointed at the event, who may sign a set-aside. */
    steward: await holdsAppointment(access.eventId, access.user.id, 'steward'),
    /** Whether the person asking is the appointed chief timekeeper, who accounts for a gap in the timing evidence. */
    chiefTimekeeper: await holdsAppointment(access.eventId, access.user.id, 'chief-timekeeper'),
    /** The stewards' confirmation of the result: who signed, how many must, what it waits for. */
    confirmation: {
      required: r.confirmation.required,
      quorum: r.confirmation.quorum,
      confirmed: r.confirmation.confirmed,
      signers: r.confirmation.signers.map(s => ({ name: s.name, at: s.at })),
      after: r.confirmation.after,
      afterClock: r.confirmation.afterClock,
      waits: r.confirmation.waits,
    },
    result: r.live.result,
    entry: r.live.entry,
    distances: r.live.distances.map(d => ({ distanceId: d.distanceId, label: d.label, start: d.start })),
  }
})
