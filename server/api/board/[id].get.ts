import { eq } from 'drizzle-orm'
import { idParams } from '#shared/schemas/event-day'

// public route: the public board of an event whose organiser opted in: runs, speeds and results for spectators and the
// press. No personal data: machines, teams (organisations) and classes; no rider, no person, no note.
export default defineEventHandler(async (event) => {
  const { id } = validParams(event, idParams)
  const [row] = await useDb().select({ publicBoard: tables.events.publicBoard }).from(tables.events)
    .where(eq(tables.events.id, id))
  if (!row?.publicBoard) throw notFound('No public board for this event')
  const day = await loadEventDay(id)
  const attempts = computeLive(day)
  setResponseHeader(event, 'cache-control', 'public, max-age=5')
  return {
    event: { id: day.event.id, name: day.event.name, venue: day.event.venue, timeZone: day.event.timeZone },
    now: new Date().toISOString(),
    decimals: day.event.profile.figures.value.decimals,
    attempts: attempts
      .filter(a => a.runs.length)
      .map(a => ({
        id: a.id,
        machine: a.entry.machineName,
        team: a.entry.teamName,
        className: a.entry.className,
        distance: a.entry.distanceLabel,
        standingRecord: a.standingRecord ? { speed: a.standingRecord.speed, unit: a.standingRecord.unit } : null,
        runs: a.runs.map(r => ({
          id: r.id,
          direction: r.direction,
          startedAt: r.startedAt,
          aborted: r.status === 'aborted',
          timeS: r.official?.timeS ?? null,
          kmh: r.official?.kmh ?? null,
          mph: r.official?.mph ?? null,
        })),
        result: a.result ? { kmh: a.result.kmh, mph: a.result.mph } : null,
        valid: a.valid,
        beatsRecord: a.beatsRecord,
        signed: a.sheet.locked,
      }))
      .sort((x, y) => (y.runs.at(-1)?.startedAt ?? '').localeCompare(x.runs.at(-1)?.startedAt ?? '')),
  }
})
