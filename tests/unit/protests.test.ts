import { describe, expect, it } from 'vitest'
import { profiles } from '#shared/rules/profiles'
import { clockTime, confirmableAfter, confirmationWaits, consequencesOn, deadlineAfter, describeProtestRule, openProtests, type ConfirmationFacts, type DecidedProtest } from '#shared/rules/protests'

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

// The stewards confirm a result only once it can no longer be protested or appealed (sporting codes: results are
// provisional until the protest period has passed and any protest is decided; common practice, from memory).
describe('when the stewards may confirm a result', () => {
  const intl = profiles['intl-motorcycle']!.protests!.value // 30 min to protest, 60 min to give notice of appeal
  const club = profiles['club-same-direction']!.protests!.value // 60 min; appeal by noon the next day
  const facts = (over: Partial<ConfirmationFacts> = {}): ConfirmationFacts => ({
    attemptId: 7,
    published: [at('2026-12-05T10:00:00Z')],
    rule: intl,
    timeZone: 'Europe/Paris',
    protests: [],
    ...over,
  })
  const decided = (id: number, decidedAt: string, appealOf: number | null = null) => ({ id, attemptId: 7, appealOf, decidedAt })

  it('waits until the instant after the protest deadline: a protest lodged at the deadline is in time', () => {
    expect(new Date(confirmableAfter(facts())!).toISOString()).toBe('2026-12-05T10:30:00.000Z')
    // 10:30 UTC is 11:30 in Paris (UTC+1 in December).
    expect(confirmationWaits(facts(), at('2026-12-05T10:30:00Z'))).toEqual(['the protest and appeal periods run until 11:30 on 2026-12-05 (Europe/Paris)'])
    expect(confirmationWaits(facts(), at('2026-12-05T10:30:00.001Z'))).toEqual([])
  })
  it('counts from the latest thing published: an inspection signed after the timing sheet', () => {
    const f = facts({ published: [at('2026-12-05T10:00:00Z'), at('2026-12-05T10:20:00Z')] })
    expect(new Date(confirmableAfter(f)!).toISOString()).toBe('2026-12-05T10:50:00.000Z')
    expect(confirmationWaits(f, at('2026-12-05T10:40:00Z'))).toHaveLength(1)
  })
  it('waits for every open protest and appeal of the attempt, not for another attempt\'s', () => {
    const open = [{ id: 3, attemptId: 7, appealOf: null, decidedAt: null }, { id: 4, attemptId: 8, appealOf: null, decidedAt: null }]
    expect(confirmationWaits(facts({ protests: open }), at('2026-12-05T12:00:00Z'))).toEqual(['protest #3 is not decided'])
    const appealOpen = [decided(3, '2026-12-05T10:40:00Z'), { id: 5, attemptId: 7, appealOf: 3, decidedAt: null }]
    expect(confirmationWaits(facts({ protests: appealOpen }), at('2026-12-05T12:00:00Z'))).toEqual(['appeal #5 is not decided'])
  })
  it('waits out the appeal period of a decision nobody appealed, to the millisecond', () => {
    const f = facts({ protests: [decided(3, '2026-12-05T10:40:00Z')] })
    // Notice of appeal within 60 min of the decision: 11:40 UTC.
    expect(new Date(confirmableAfter(f)!).toISOString()).toBe('2026-12-05T11:40:00.000Z')
    expect(confirmationWaits(f, at('2026-12-05T11:40:00Z'))).toHaveLength(1)
    expect(confirmationWaits(f, at('2026-12-05T11:40:00.001Z'))).toEqual([])
    // Once appealed and the appeal decided, its period does not apply: the appeal body has decided.
    const appealed = facts({ protests: [decided(3, '2026-12-05T10:40:00Z'), decided(5, '2026-12-05T10:50:00Z', 3)] })
    expect(confirmableAfter(appealed)).toBe(at('2026-12-05T10:30:00Z'))
  })
  it('counts a clock deadline in the event\'s zone: a club appeal by noon the next day', () => {
    // Decided 16:00 on 5 December in Denver (UTC-7): the appeal runs until 12:00 on the 6th there, 19:00 UTC.
    const f = facts({ rule: club, timeZone: 'America/Denver', published: [at('2026-12-05T22:00:00Z')], protests: [decided(3, '2026-12-05T23:00:00Z')] })
    expect(new Date(confirmableAfter(f)!).toISOString()).toBe('2026-12-06T19:00:00.000Z')
    expect(confirmationWaits(f, at('2026-12-06T19:00:00.001Z'))).toEqual([])
  })
  it('without protests, is the latest publication; without an appeal, no appeal period is waited for', () => {
    expect(confirmableAfter(facts({ rule: null, published: [at('2026-12-05T10:20:00Z'), at('2026-12-05T10:00:00Z')] })))
      .toBe(at('2026-12-05T10:20:00Z'))
    const noAppeal = facts({ rule: { ...intl, appeal: null }, protests: [decided(3, '2026-12-05T10:40:00Z')] })
    expect(confirmableAfter(noAppeal)).toBe(at('2026-12-05T10:30:00Z'))
  })
  it('asks nothing to wait for where the profile provides no protests, and refuses what is not published', () => {
    expect(confirmationWaits(facts({ rule: null }), at('2026-12-05T10:00:00.001Z'))).toEqual([])
    expect(confirmableAfter(facts({ published: [] }))).toBeNull()
    expect(confirmationWaits(facts({ published: [] }), at('2026-12-06T00:00:00Z'))).toEqual(['the result is not published yet: its timing sheet is not signed'])
  })
})
