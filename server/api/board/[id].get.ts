import { and, eq } from 'drizzle-orm'
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
  const ratified = await ratifiedClaims(id)
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
        /** Every distance the same passes claim: its result, whether it counts and why not, and its ratification. */
        // Why the attempt's own distance does not count (the live results keep the findings of that one).
        why: a.valid || !a.result
          ? []
          : publicReasons([...a.findings, ...a.runs.filter(r => r.counted).flatMap(r => r.findings)]),
        distances: a.distances.map(d => ({
          label: d.label,
          result: d.result ? { kmh: d.result.kmh, mph: d.result.mph } : null,
          valid: d.valid,
          beatsRecord: d.beatsRecord,
          standingRecord: d.standingRecord ? { speed: d.standingRecord.speed, unit: d.standingRecord.unit } : null,
          ratified: ratified.has(`${a.id}:${d.distanceId}`),
        })),
      }))
      .sort((x, y) => (y.runs.at(-1)?.startedAt ?? '').localeCompare(x.runs.at(-1)?.startedAt ?? '')),
  }
})

/**
 * Why a result does not count, in the findings' own words: the failing ones that stand, each once. None about a
 * person (the rider's licence or medical): the board carries no personal data.
 */
function publicReasons(findings: { code: string, severity: string, message: string, setAside?: unknown }[]) {
  const personal = (code: string) => code.startsWith('rider.') || code.startsWith('licence.')
  const failing = findings.filter(f => f.severity === 'fail' && !f.setAside && !f.code.startsWith('record.'))
  const said = failing.filter(f => !personal(f.code)).map(f => f.message)
  if (failing.some(f => personal(f.code))) said.push('A condition on the rider is not met.')
  return [...new Set(said)]
}

/** The claims of the event ratified and not revoked, as `attempt:distance`. */
async function ratifiedClaims(eventId: number) {
  const rows = await useDb()
    .select({ attemptId: tables.dossiers.attemptId, distanceId: tables.dossiers.distanceId,
      revoked: tables.claimRevocations.id })
    .from(tables.decisions)
    .innerJoin(tables.dossiers, eq(tables.dossiers.id, tables.decisions.dossierId))
    .leftJoin(tables.claimRevocations, eq(tables.claimRevocations.dossierId, tables.dossiers.id))
    .where(and(eq(tables.dossiers.eventId, eventId), eq(tables.decisions.decision, 'ratified')))
  return new Set(rows.filter(r => !r.revoked).map(r => `${r.attemptId}:${r.distanceId}`))
}
