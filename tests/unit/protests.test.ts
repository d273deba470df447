import { describe, expect, it } from 'vitest'
import { profiles } from '#shared/rules/profiles'
import { clockTime, consequencesOn, deadlineAfter, describeProtestRule, openProtests, type DecidedProtest } from '#shared/rules/protests'

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

describe('what an upheld protest makes void', () => {
  // Sporting codes, common practice: the stewards' decision stands unless the appeal body decides otherwise; a
  // protest still open decides nothing yet (it blocks the claim on its own). Invented ids.
  const at = '2026-12-05T10:00:00.000Z'
  const protest = (x: Partial<DecidedProtest> = {}): DecidedProtest =>
    ({ id: 1, attemptId: 7, appealOf: null, decidedAt: at, outcome: 'upheld', voids: 'result', voidRunId: null, ...x })
  const appeal = (x: Partial<DecidedProtest> = {}): DecidedProtest =>
    protest({ id: 2, appealOf: 1, voids: 'nothing', ...x })

  it('an upheld protest voids what it names; a dismissed one, or one voiding nothing, voids nothing', () => {
    expect(consequencesOn([protest()], 7)).toEqual([{ protestId: 1, decidedBy: 1, voids: 'result', runId: null }])
    expect(consequencesOn([protest({ voids: 'run', voidRunId: 31 })], 7)).toEqual([{ protestId: 1, decidedBy: 1, voids: 'run', runId: 31 }])
    expect(consequencesOn([protest({ outcome: 'dismissed', voids: 'nothing' })], 7)).toEqual([])
    expect(consequencesOn([protest({ voids: 'nothing' })], 7)).toEqual([])
    // A decision from before the consequence was recorded (none stored) voids nothing.
    expect(consequencesOn([protest({ voids: null })], 7)).toEqual([])
    // A dismissal voids nothing, whatever it records (the decision form refuses such a record; this holds anyway).
    expect(consequencesOn([protest({ outcome: 'dismissed', voids: 'result' })], 7)).toEqual([])
  })

  it('only the attempt\'s own protests, only decided ones', () => {
    expect(consequencesOn([protest({ attemptId: 8 })], 7)).toEqual([])
    expect(consequencesOn([protest({ decidedAt: null })], 7)).toEqual([])
  })

  it('an appeal decided and upheld replaces the decision; one dismissed or still open leaves it', () => {
    // Upheld on appeal by the attempt's team: nothing void.
    expect(consequencesOn([protest(), appeal()], 7)).toEqual([])
    // Dismissed on appeal: the protest's decision stands.
    expect(consequencesOn([protest(), appeal({ outcome: 'dismissed' })], 7)).toEqual([{ protestId: 1, decidedBy: 1, voids: 'result', runId: null }])
    // Open: the protest's decision stands meanwhile.
    expect(consequencesOn([protest(), appeal({ decidedAt: null, outcome: null, voids: null })], 7)).toEqual([{ protestId: 1, decidedBy: 1, voids: 'result', runId: null }])
    // A dismissed protest, upheld on appeal by the protester: the appeal's consequence.
    expect(consequencesOn([protest({ outcome: 'dismissed', voids: 'nothing' }), appeal({ voids: 'run', voidRunId: 31 })], 7))
      .toEqual([{ protestId: 1, decidedBy: 2, voids: 'run', runId: 31 }])
  })
})
