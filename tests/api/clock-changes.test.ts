import { describe, expect, it } from 'vitest'
import { call, useTestServer } from '../support/api'
import { clearedEntry } from '../support/entries'
import { kilometreRun } from '../support/runs'
import { newTestEvent } from '../support/test-event'

await useTestServer()

// A reading's time of day is placed at the instant, nearest its run's start, at which the event's clock showed it:
// on the days the clocks change, an hour is repeated or skipped, and a pair's window is held in real time. The
// change instants are those of the IANA time zone database: America/Denver went back from 02:00 MDT (UTC-6) to
// 01:00 MST (UTC-7) on 1 November 2026 (08:00 UTC); Europe/Paris went forward from 02:00 CET (UTC+1) to 03:00 CEST
// (UTC+2) on 29 March 2026 (01:00 UTC). Window: 2 h for the international motorcycle profile, start of the first
// run to finish of the second (published rule). Hand computations beside each check. Invented set-up.
const both = (s: number) => ({ primary: [0, s] as [number, number], backup: [0, s] as [number, number] })

async function pairAt(zone: string, outIso: string, backIso: string, name: string, timeBase: 'local' | 'utc' = 'local') {
  const event = await newTestEvent('intl-motorcycle', zone)
  if (timeBase === 'utc') {
    const setup = (await call('GET', `/api/events/${event.eventId}/setup`, { cookie: event.cookie.organiser })).body
    for (const system of setup.systems) {
      const r = await call('PATCH', `/api/events/${event.eventId}/setup/timing-systems/${system.id}`, {
        cookie: event.cookie.organiser,
        body: { ...system, timeBase: 'utc', synchronisation: 'to GPS time, shown as UTC', reason: 'the devices show UTC' },
      })
      expect(r.status, JSON.stringify(r.body)).toBe(200)
    }
  }
  const entryId = await clearedEntry(event.eventId, name, {}, {
    team: event.cookie.team, scrutineer: event.cookie.scrutineer, scrutineerPassword: 'first-password-1',
  })
  // The times of day are typed as the devices show them: in the event's zone, or in UTC.
  const place = { eventId: event.eventId, timeZone: timeBase === 'utc' ? 'UTC' : zone, timekeeper: event.cookie.timekeeper, traps: event.traps, systems: event.systems }
  const out = await kilometreRun(place, entryId, 'out', Date.parse(outIso), both(8.9))
  await kilometreRun(place, entryId, 'back', Date.parse(backIso), both(8.9))
  const live = (await call('GET', `/api/events/${event.eventId}/live`, { cookie: event.cookie.organiser })).body
  return live.find((a: { id: number }) => a.id === out.attemptId)
}

describe('a pair on a day the clocks change', () => {
  it('in the hour repeated in Denver, a pair that ends 120.1 min after it began exceeds a 2 h window', async () => {
    // Out at 00:30 MDT (06:30:00Z); back at 01:29 MST (08:29:00Z, 119 min on: it joins the attempt), its last trap
    // at 01:30:08.9 MST (08:30:08.9Z). 08:30:08.9 − 06:30:00 = 120 min 8.9 s: 120.1 min, truncated. Counted from
    // local midnight (06:00Z) the back run would end at 07:30:08.9Z, 60.1 min: inside the window.
    const a = await pairAt('America/Denver', '2026-11-01T06:30:00Z', '2026-11-01T08:29:00Z', 'Repeated hour machine')
    expect(a.runs.length).toBe(2)
    expect(a.findings.find((f: { code: string }) => f.code === 'window.exceeded')?.message)
      .toBe('The runs took 120.1 min between the anchors; the window is 120 min from the start of the first run to the finish of the second run.')
    expect(a.valid).toBe(false)
  })

  it('across the hour skipped in Paris, a pair 111 min apart in real time is within the window', async () => {
    // Out at 00:50 CET (23:50:00Z the day before); back at 03:40 CEST (01:40:00Z), its last trap at 03:41:08.9 CEST
    // (01:41:08.9Z). 01:41:08.9 − 23:50:00 = 111 min 8.9 s. Counted from local midnight (23:00Z) the back run would
    // end at 02:41:08.9Z, 171.1 min: over the window.
    const a = await pairAt('Europe/Paris', '2026-03-28T23:50:00Z', '2026-03-29T01:40:00Z', 'Skipped hour machine')
    const codes = a.findings.map((f: { code: string }) => f.code)
    expect(codes).not.toContain('window.exceeded')
    expect(codes).not.toContain('pair.overlap')
    expect(a.window.ok).toBe(true)
    expect(a.valid).toBe(true)
  })

  it('read on devices set to UTC, a pair in Paris is held to its window in real time', async () => {
    // Paris is UTC+1 in December. Out at 10:00:00Z, back at 11:59:00Z, its last trap at 12:00:08.9Z, typed as the
    // devices show it (UTC): 120 min 8.9 s, over the 2 h window. Read as Paris time, 12:00:08.9 would be 11:00:08.9Z,
    // 60.1 min: inside it.
    const a = await pairAt('Europe/Paris', '2026-12-01T10:00:00Z', '2026-12-01T11:59:00Z', 'UTC clock machine', 'utc')
    expect(a.runs.length).toBe(2)
    expect(a.findings.find((f: { code: string }) => f.code === 'window.exceeded')?.message)
      .toBe('The runs took 120.1 min between the anchors; the window is 120 min from the start of the first run to the finish of the second run.')
  })
})
