import { expect } from 'vitest'
import { call } from './api'

/** Where runs are entered: the event, its zone, the timekeeper, and the ids of its kilometre traps and systems. */
export interface RunPlace {
  eventId: number
  timeZone: string
  timekeeper: string
  traps: Record<'K-in' | 'K-out', number>
  systems: Record<'primary' | 'backup', number>
}

/** hh:mm:ss.ffff of an instant on the event's clock. */
export const eventClockTime = (ms: number, timeZone: string) =>
  `${new Date(ms).toLocaleTimeString('sv-SE', { timeZone })}.${String(ms % 1000).padStart(3, '0')}0`

/**
 * A run over the flying kilometre started at `startMs` (whole seconds), reaching its first trap a
 * minute later; each system's two traps at the given offsets (seconds) from that moment.
 */
export async function kilometreRun(
  at: RunPlace,
  entryId: number,
  direction: 'out' | 'back',
  startMs: number,
  offsets: Record<'primary' | 'backup', [number, number]>,
) {
  const run = await call('POST', `/api/events/${at.eventId}/runs`, {
    cookie: at.timekeeper,
    body: { entryId, direction, startedAt: new Date(startMs).toISOString() },
  })
  expect(run.status, JSON.stringify(run.body)).toBe(201)
  const order = direction === 'out' ? (['K-in', 'K-out'] as const) : (['K-out', 'K-in'] as const)
  for (const role of ['primary', 'backup'] as const) {
    for (const [i, trap] of order.entries()) {
      const time = eventClockTime(startMs + 60_000 + Math.round(offsets[role][i]! * 1000), at.timeZone)
      const r = await call('POST', `/api/runs/${run.body.id}/readings`, {
        cookie: at.timekeeper,
        body: { trapId: at.traps[trap], systemId: at.systems[role], time },
      })
      expect(r.status, JSON.stringify(r.body)).toBe(201)
    }
  }
  return run.body as { id: number, attemptId: number }
}

/** A whole second some minutes ago. */
export const minutesAgo = (minutes: number) => Math.floor((Date.now() - minutes * 60_000) / 1000) * 1000
