import { describe, expect, it } from 'vitest'
import { impoundFindings } from '#shared/rules/attempt-impound'
import { placeRun, type OpenAttempt } from '#shared/rules/run-placement'
import { leaveBy } from '#shared/rules/leave-by'
import { evaluateWindow } from '#shared/rules/attempt-window'
import { fromDecimal, q } from '#shared/rules/exact'
import { copyProfile, profiles } from '#shared/rules/profiles'
import { describeDeadline, describeProtestRule } from '#shared/rules/protests'

// The club procedure's impound: within 60 min of the qualifying run's time slip (club record procedure pages, seen);
// where a new run goes (the profile's directions and window); when the return run must leave; protest wording.
const club = profiles['club-same-direction']
const moto = profiles['intl-motorcycle']
const FINISH = Date.parse('2026-12-05T09:00:10Z')

describe('the impound after a qualifying run, at its edges', () => {
  const rule = { name: 'Impound after a qualifying run', value: 'within 60 min of the time slip', source: club.impoundMinutes.source, certainty: 'seen' }
  it('a check-in from the qualifier\'s finish to 60 min after it is in time; a millisecond either side is not', () => {
    expect(impoundFindings(club, FINISH, FINISH, false, 'UTC')).toEqual({ deadlineMs: FINISH + 3_600_000, findings: [] })
    expect(impoundFindings(club, FINISH, FINISH + 3_600_000, true, 'UTC').findings).toEqual([])
    expect(impoundFindings(club, FINISH, FINISH - 1, false, 'UTC').findings).toEqual([{ code: 'impound.before-run', severity: 'fail', rule,
      message: 'The impound check-in at 2026-12-05 09:00:09 (UTC) is before the qualifying run finished.' }])
    expect(impoundFindings(club, FINISH, FINISH + 3_600_001, true, 'UTC').findings).toEqual([{ code: 'impound.late', severity: 'fail', rule,
      message: 'The machine went into impound at 2026-12-05 10:00:10 (UTC), 1 min after the limit of 2026-12-05 10:00:10 (UTC).' }])
    // 2 min 30 s late is said as 3 min, rounded up.
    expect(impoundFindings(club, FINISH, FINISH + 3_750_000, true, 'UTC').findings[0]!.message).toContain(', 3 min after the limit')
  })
  it('waits for the check-in before the record run, and fails a record run without one', () => {
    expect(impoundFindings(club, FINISH, null, false, 'America/Denver').findings).toEqual([{ code: 'impound.awaiting', severity: 'info', rule,
      message: 'The machine goes into impound by 2026-12-05 03:00:10 (America/Denver).' }])
    expect(impoundFindings(club, FINISH, null, true, 'UTC').findings).toEqual([{ code: 'impound.missing', severity: 'fail', rule,
      message: 'No impound check-in is recorded after the qualifying run.' }])
  })
  it('says nothing where there is no qualifying run, no limit, or no tracking', () => {
    expect(impoundFindings(moto, FINISH, null, true, 'UTC')).toEqual({ deadlineMs: null, findings: [] })
    const noLimit = copyProfile(club, { impoundMinutes: { value: null, source: 'test rulebook, art. 7', certainty: 'seen' } })
    expect(impoundFindings(noLimit, FINISH, null, true, 'UTC')).toEqual({ deadlineMs: null, findings: [] })
    expect(impoundFindings(club, FINISH, undefined, true, 'UTC')).toEqual({ deadlineMs: null, findings: [] })
  })
})

describe('where a new run goes', () => {
  const T0 = Date.parse('2026-12-05T09:00:00Z')
  const open = (extra: Partial<OpenAttempt> = {}): OpenAttempt =>
    ({ id: 4, runs: [{ id: 11, direction: 'out', startedAtMs: T0 }], windowDeadlineMs: null, windowOpensMs: null, ...extra })
  it('starts an attempt with no open one, and is the first run of an empty one', () => {
    expect(placeRun(moto, null, { direction: 'out', startedAtMs: T0 }, 'UTC')).toEqual({ joins: null, closes: null, message: 'This run starts a new attempt.' })
    expect(placeRun(moto, open({ runs: [] }), { direction: 'back', startedAtMs: T0 }, 'UTC')).toEqual({ joins: 4, message: 'This run is the first of attempt #4.' })
  })
  it('pairs the run in the other direction within 2 h of the first start; a millisecond later starts anew', () => {
    expect(placeRun(moto, open(), { direction: 'back', startedAtMs: T0 + 7_200_000 }, 'UTC'))
      .toEqual({ joins: 4, message: 'This run is the back run of attempt #4, pairing with run #11.' })
    expect(placeRun(moto, open(), { direction: 'back', startedAtMs: T0 + 7_200_001 }, 'UTC')).toEqual({ joins: null, closes: 4,
      message: 'This run starts a new attempt. It starts after attempt #4\'s window of 120 min closed. Attempt #4 keeps its one run (#11, out).' })
    expect(placeRun(moto, open({ runs: [{ id: 11, direction: 'back', startedAtMs: T0 }] }), { direction: 'out', startedAtMs: T0 + 60_000 }, 'UTC').joins).toBe(4)
    expect(placeRun(moto, open(), { direction: 'out', startedAtMs: T0 + 60_000 }, 'UTC').message)
      .toBe('This run starts a new attempt. Attempt #4 has its out run already; its second run must go back. Attempt #4 keeps its one run (#11, out).')
  })
  it('under the club\'s rule: the same direction, before the next-day window closes', () => {
    const next = open({ windowDeadlineMs: T0 + 86_400_000 })
    expect(placeRun(club, next, { direction: 'out', startedAtMs: T0 + 86_400_000 }, 'UTC').joins).toBe(4)
    expect(placeRun(club, next, { direction: 'out', startedAtMs: T0 + 86_400_001 }, 'UTC').message)
      .toBe('This run starts a new attempt. It starts after attempt #4\'s window closed. Attempt #4 keeps its one run (#11, out).')
    expect(placeRun(club, next, { direction: 'back', startedAtMs: T0 + 60_000 }, 'UTC').message)
      .toBe('This run starts a new attempt. Both runs of a pair go the same way under this profile; attempt #4 went out. Attempt #4 keeps its one run (#11, out).')
    expect(placeRun(club, open(), { direction: 'out', startedAtMs: T0 + 30 * 86_400_000 }, 'UTC').joins).toBe(4)
  })
  it('a window from a finish not yet known: the same local day pairs, another does not', () => {
    const fromFinish = copyProfile(moto, { window: { value: { kind: 'elapsed', minutes: 30, from: 'finish-first', to: 'start-second' }, source: 'test rulebook, art. 5', certainty: 'seen' } })
    // 09:00 UTC is 22:00 the same day in Pago Pago (UTC−11); 11:00 UTC is 00:00 the next day there.
    expect(placeRun(fromFinish, open(), { direction: 'back', startedAtMs: T0 + 7_199_999 }, 'Pacific/Pago_Pago').joins).toBe(4)
    expect(placeRun(fromFinish, open(), { direction: 'back', startedAtMs: T0 + 7_200_000 }, 'Pacific/Pago_Pago').message)
      .toBe('This run starts a new attempt. Attempt #4\'s run was on another day. Attempt #4 keeps its one run (#11, out).')
    expect(placeRun(fromFinish, open({ windowDeadlineMs: T0 + 1_000 }), { direction: 'back', startedAtMs: T0 + 1_001 }, 'UTC').joins).toBeNull()
  })
})

describe('when the return run must leave the line', () => {
  const T0 = Date.parse('2026-12-05T09:00:00Z')
  const first = { direction: 'out' as const, startedAtMs: T0, elapsedS: fromDecimal('10'), finishedAtMs: T0 + 40_000 }
  it('a window that closes at a finish: the deadline less the first run\'s run-up and the time over the distance', () => {
    const w = evaluateWindow(moto, [first], 'UTC')
    // Run-up: 40 s to leave the distance − 10 s over it = 30 s; over the distance: the first run's 10 s.
    expect(leaveBy(w, first, null, 3)).toEqual({ atMs: T0 + 7_200_000 - 40_000, deadlineMs: T0 + 7_200_000, closesAt: 'finish',
      runUpS: '30.000', overDistanceS: '10.000', overDistanceBasis: 'first-run', runUpUnknown: false })
    // With a return target from the record, 9.5 s: that instead.
    expect(leaveBy(w, first, fromDecimal('9.5'), 3)).toMatchObject({ atMs: T0 + 7_200_000 - 39_500, overDistanceS: '9.500', overDistanceBasis: 'record' })
    // No last-trap instant: the run-up is unknown, taken as none, and said.
    const estimated = { ...first, finishedAtMs: undefined }
    expect(leaveBy(evaluateWindow(moto, [estimated], 'UTC'), estimated, null, 3)).toMatchObject({ runUpS: '0.000', runUpUnknown: true, atMs: T0 + 7_200_000 - 10_000 })
  })
  it('a window that closes at the second start gives that instant; one that closes at a first-run anchor gives none', () => {
    const startWindow = copyProfile(moto, { window: { value: { kind: 'elapsed', minutes: 30, from: 'start-first', to: 'start-second' }, source: 'test rulebook, art. 5', certainty: 'seen' } })
    expect(leaveBy(evaluateWindow(startWindow, [first], 'UTC'), first, null, 3)).toEqual({ atMs: T0 + 1_800_000, deadlineMs: T0 + 1_800_000,
      closesAt: 'start', runUpS: null, overDistanceS: null, overDistanceBasis: null, runUpUnknown: false })
    expect(leaveBy({ ok: true, rule: '', usedS: null, deadlineMs: T0, opensMs: null, closingAnchor: 'finish-first' }, first, null, 3)).toBeNull()
    expect(leaveBy({ ok: true, rule: '', usedS: null, deadlineMs: null, opensMs: null, closingAnchor: 'finish-second' }, first, null, 3)).toBeNull()
    expect(leaveBy({ ok: true, rule: '', usedS: null, deadlineMs: T0, opensMs: null, closingAnchor: null }, first, q(10n), 3)).toBeNull()
  })
})

describe('protest deadlines in words', () => {
  it('says the day of a clock deadline and the fee and appeal, or their absence', () => {
    expect(describeDeadline({ kind: 'clock', at: '18:00', daysAfter: 0 })).toBe('by 18:00 the same day, event\'s clock')
    expect(describeDeadline({ kind: 'clock', at: '12:00', daysAfter: 1 })).toBe('by 12:00 the next day, event\'s clock')
    expect(describeDeadline({ kind: 'clock', at: '09:00', daysAfter: 3 })).toBe('by 09:00 3 days later, event\'s clock')
    expect(describeDeadline({ kind: 'minutes', minutes: 30 })).toBe('within 30 min')
    expect(describeProtestRule({ lodge: { kind: 'minutes', minutes: 30 }, fee: null, appeal: null })).toBe('protest within 30 min of publication; no fee; no appeal')
  })
})
