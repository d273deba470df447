import { describe, expect, it } from 'vitest'
import { profiles } from '#shared/rules/profiles'
import { clockTime, deadlineAfter, describeProtestRule, openProtests } from '#shared/rules/protests'

// Protest deadlines in the event's zone. The international profiles' 30 min after publication and 1 h for notice of
// appeal are recalled from the sporting codes (from memory); the club's hour and noon the next day are common
// practice. Zone offsets are those of the IANA time zone database.
const at = (iso: string) => Date.parse(iso)

describe('protest deadlines', () => {
  it('counts minutes from publication, across a change of the local day', () => {
    // 23:50 in Denver (UTC-7 in December) is 06:50 UTC; 30 min later is 00:20 the next local day.
    const published = at('2026-12-05T06:50:00Z')
    const due = deadlineAfter(published, { kind: 'minutes', minutes: 30 }, 'America/Denver')
    expect(new Date(due).toISOString()).toBe('2026-12-05T07:20:00.000Z')
    expect(clockTime(due, 'America/Denver')).toBe('00:20 on 2026-12-05 (America/Denver)')
    expect(clockTime(published, 'America/Denver')).toBe('23:50 on 2026-12-04 (America/Denver)')
  })
  it('puts a clock deadline on the local day of publication, or days after it', () => {
    // Published 23:30 on 4 December in Auckland (UTC+13 in December, daylight time) = 10:30 UTC the same date;
    // noon on the 5th there is 23:00 UTC on the 4th.
    const published = at('2026-12-04T10:30:00Z')
    const noonNext = deadlineAfter(published, { kind: 'clock', at: '12:00', daysAfter: 1 }, 'Pacific/Auckland')
    expect(new Date(noonNext).toISOString()).toBe('2026-12-04T23:00:00.000Z')
    expect(clockTime(noonNext, 'Pacific/Auckland')).toBe('12:00 on 2026-12-05 (Pacific/Auckland)')
    // Across the change to summer time in Denver (8 March 2026, 02:00 → 03:00): noon the next day is UTC-6.
    const beforeShift = at('2026-03-07T20:00:00Z')
    expect(new Date(deadlineAfter(beforeShift, { kind: 'clock', at: '12:00', daysAfter: 1 }, 'America/Denver'))
      .toISOString()).toBe('2026-03-08T18:00:00.000Z')
  })
  it('describes each profile\'s rule in words', () => {
    expect(describeProtestRule(profiles['intl-motorcycle'].protests!.value)).toBe('protest within 30 min of '
      + 'publication; fee: set by the national authority that issued the permit; appeal to the national court of '
      + 'appeal of the permit\'s issuer, within 60 min of the decision')
    expect(describeProtestRule(profiles['club-same-direction'].protests!.value)).toContain(
      'appeal to the club\'s board, by 12:00 the next day, event\'s clock of the decision')
  })
  it('counts a protest or appeal open until it is decided', () => {
    const list = [
      { id: 1, attemptId: 5, appealOf: null, decidedAt: '2026-12-04T10:00:00Z' },
      { id: 2, attemptId: 5, appealOf: 1, decidedAt: null },
      { id: 3, attemptId: 6, appealOf: null, decidedAt: null },
    ]
    expect(openProtests(list, 5).map(p => p.id)).toEqual([2])
    expect(openProtests(list, 7)).toEqual([])
  })
})
