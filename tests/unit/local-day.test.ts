import { describe, expect, it } from 'vitest'
import { addDays, localDate, localDateTime, localMidnight, localToInstant } from '#shared/rules/zoned'
import { deadlineAfter } from '#shared/rules/protests'
import { startLineFindings, type StartLineInput } from '#shared/rules/start-line'

// The event's calendar day is the local date in its zone, never the UTC date. For every hour of the UTC day
// the examples below pick a zone whose local date differs from the UTC date at that hour, so a rule that took
// the UTC date fails whatever hour the suite runs and whatever the machine's own zone is (the unit tests run
// in three). Offsets from the IANA time zone database: Pacific/Pago_Pago is UTC−11 all year, Pacific/Kiritimati
// UTC+14 all year (neither keeps summer time).
const HOURS = Array.from({ length: 24 }, (_, h) => h)
/** 5 December 2026 at hh:30 UTC; the local date is the 4th in Pago Pago before 11:00 UTC, the 6th in Kiritimati from 10:00 UTC. */
function example(h: number) {
  const ms = Date.parse(`2026-12-05T${String(h).padStart(2, '0')}:30:00Z`)
  return h < 10
    ? { h, ms, zone: 'Pacific/Pago_Pago', local: '2026-12-04', offsetH: -11 }
    : { h, ms, zone: 'Pacific/Kiritimati', local: '2026-12-06', offsetH: 14 }
}

describe.each(HOURS.map(example))('at $h:30 UTC on 5 December, in $zone', ({ ms, zone, local, offsetH }) => {
  it('the local date is not the UTC date', () => {
    expect(localDate(ms, zone)).toBe(local)
    expect(localDate(ms, zone)).not.toBe(new Date(ms).toISOString().slice(0, 10))
    // The wall clock: UTC hour + the offset, taken into the local day.
    const hour = (new Date(ms).getUTCHours() + offsetH + 24) % 24
    expect(localDateTime(ms, zone)).toBe(`${local} ${String(hour).padStart(2, '0')}:30:00`)
  })

  it('local midnight of that date and a wall-clock time in it are instants of that zone', () => {
    // Midnight local = 00:00 − offset in UTC: 11:00 UTC the same date in Pago Pago, 10:00 UTC the day before in Kiritimati.
    expect(localMidnight(local, zone)).toBe(Date.parse(`${local}T00:00:00Z`) - offsetH * 3_600_000)
    expect(localToInstant(`${local}T12:00`, zone)).toBe(Date.parse(`${local}T12:00:00Z`) - offsetH * 3_600_000)
  })

  it('a clock deadline ("by noon the next day", club practice) falls on the next local day', () => {
    const due = deadlineAfter(ms, { kind: 'clock', at: '12:00', daysAfter: 1 }, zone)
    // Noon on the local date + 1, as UTC: 23:00 on the 5th in Pago Pago, 22:00 on the 6th in Kiritimati.
    expect(due).toBe(Date.parse(`${addDays(local, 1)}T12:00:00Z`) - offsetH * 3_600_000)
    expect(localDateTime(due, zone)).toBe(`${addDays(local, 1)} 12:00:00`)
    // Same-day deadline: noon on the local date of publication.
    const sameDay = deadlineAfter(ms, { kind: 'clock', at: '12:00', daysAfter: 0 }, zone)
    expect(localDateTime(sameDay, zone)).toBe(`${local} 12:00:00`)
  })

  it('a licence or medical is valid through its last local day, and not the day after', () => {
    // A document valid "until" a date is valid on that day (common practice for licences and medicals).
    const input = (expires: string): StartLineInput => ({
      licence: { grades: null, medical: true },
      briefingRequired: false,
      rider: { name: 'R', licenceNo: 'L', licenceExpires: expires, licenceGrade: null, medicalExpires: expires },
      day: localDate(ms, zone),
      expectedKmh: null,
      upgrade: false,
      briefing: null,
    })
    expect(startLineFindings(input(local))).toEqual([])
    expect(startLineFindings(input(addDays(local, -1))).map(f => f.code)).toEqual(['licence.expired', 'licence.medical'])
    // Expiring on the UTC date: still valid where the local date is the 4th, expired where it is the 6th.
    const utcDay = new Date(ms).toISOString().slice(0, 10)
    expect(startLineFindings(input(utcDay)).length).toBe(local < utcDay ? 0 : 2)
  })
})

describe('calendar arithmetic on dates (proleptic Gregorian calendar, ISO 8601)', () => {
  it.each([
    ['2026-12-31', 1, '2027-01-01'], ['2028-02-28', 1, '2028-02-29'], ['2027-02-28', 1, '2027-03-01'],
    ['2026-03-01', -1, '2026-02-28'], ['2024-03-01', -1, '2024-02-29'], ['2026-12-05', 0, '2026-12-05'],
    ['2026-01-31', 30, '2026-03-02'],
  ] as const)('%s %+i days → %s', (from, days, to) => {
    expect(addDays(from, days)).toBe(to)
  })
})
