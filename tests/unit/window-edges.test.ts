import { describe, expect, it } from 'vitest'
import { evaluateAttempt, type RunInput } from '#shared/rules/attempt'
import { evaluateWindow, windowFindings } from '#shared/rules/attempt-window'
import { fromDecimal, toFixed } from '#shared/rules/exact'
import { copyProfile, profiles } from '#shared/rules/profiles'
import { checkMeasuredDistance } from '#shared/rules/course'

// The time window at its close, to the millisecond. International motorcycle: 2 h from the start of the first run to
// the finish of the second (FIM world records page, seen); international automobile: 60 min (FIA Appendix D, seen);
// the club: the record run on the calendar day after the qualifying run, leaving before 12:00 local (club pages, seen).
const KM = fromDecimal('1000')
const T0 = Date.parse('2026-12-05T08:00:00Z')
const run = (direction: 'out' | 'back', startedAtMs: number, elapsedS = '10', finishedAtMs?: number): RunInput =>
  ({ direction, startedAtMs, elapsedS: fromDecimal(elapsedS), ...(finishedAtMs === undefined ? {} : { finishedAtMs }) })
const moto = profiles['intl-motorcycle']
const club = profiles['club-same-direction']

describe('an elapsed window: 120 min from the start of the first run to the finish of the second', () => {
  const HOURS2 = 7_200_000
  it('closes at the start of the first run + 2 h: a finish exactly then is within, a millisecond later is not', () => {
    // The second run finishes at its recorded last-trap instant.
    const at = [run('out', T0, '10', T0 + 10_000), run('back', T0 + HOURS2 - 60_000, '10', T0 + HOURS2)]
    const w = evaluateWindow(moto, at, 'UTC')
    expect(w).toMatchObject({ ok: true, deadlineMs: T0 + HOURS2, opensMs: null, closingAnchor: 'finish-second' })
    expect(toFixed(w.usedS!, 3)).toBe('7200.000')
    expect(windowFindings(moto, w, at)).toEqual([])
    const late = [at[0]!, run('back', T0 + HOURS2 - 60_000, '10', T0 + HOURS2 + 1)]
    const wl = evaluateWindow(moto, late, 'UTC')
    expect(wl.ok).toBe(false)
    expect(windowFindings(moto, wl, late)).toEqual([{ code: 'window.exceeded', severity: 'fail',
      message: 'The runs took 120.0 min between the anchors; the window is 120 min from the start of the first run to the finish of the second run.',
      rule: { name: 'Time window', value: '120 min from the start of the first run to the finish of the second run', source: moto.window.source, certainty: 'seen' } }])
  })
  it('estimates a finish with no last-trap instant as the start plus the time over the distance, and warns so', () => {
    // Start at T0 + 2 h − 10 s, 10 s over the distance: estimated finish exactly at the close.
    const runs = [run('out', T0), run('back', T0 + HOURS2 - 10_000)]
    const w = evaluateWindow(moto, runs, 'UTC')
    expect(w.ok).toBe(true)
    const estimated = windowFindings(moto, w, runs)
    expect(estimated.map(f => [f.code, f.severity])).toEqual([['window.estimated', 'warn']])
    expect(estimated[0]!.message).toBe('A run\'s finish is estimated as its start plus the time over the distance, which leaves out '
      + 'the run-up: the window is checked against an earlier finish than the true one.')
    const late = [run('out', T0), run('back', T0 + HOURS2 - 9_999)]
    expect(evaluateWindow(moto, late, 'UTC').ok).toBe(false)
    expect(windowFindings(moto, evaluateWindow(moto, late, 'UTC'), late).map(f => f.code)).toEqual(['window.exceeded', 'window.estimated'])
  })
  it('before the second run: open, with its deadline, and no anchors used yet', () => {
    const w = evaluateWindow(moto, [run('out', T0)], 'UTC')
    expect(w).toEqual({ ok: true, rule: '120 min from the start of the first run to the finish of the second run', usedS: null,
      deadlineMs: T0 + HOURS2, opensMs: null, closingAnchor: 'finish-second' })
  })
  it('anchors at the first run\'s finish where a profile says so: 30 min from it to the start of the second', () => {
    const fromFinish = copyProfile(moto, { window: { value: { kind: 'elapsed', minutes: 30, from: 'finish-first', to: 'start-second' }, source: 'test rulebook, art. 5', certainty: 'seen' } })
    const first = run('out', T0, '10', T0 + 12_000)
    expect(evaluateWindow(fromFinish, [first, run('back', T0 + 12_000 + 1_800_000)], 'UTC')).toMatchObject({ ok: true, deadlineMs: T0 + 12_000 + 1_800_000 })
    expect(evaluateWindow(fromFinish, [first, run('back', T0 + 12_000 + 1_800_001)], 'UTC').ok).toBe(false)
    // The finish of the first run without its last-trap instant: estimated, and said.
    const estimatedFirst = run('out', T0)
    const w = evaluateWindow(fromFinish, [estimatedFirst, run('back', T0 + 10_000 + 1_800_000)], 'UTC')
    expect(w.ok).toBe(true)
    expect(windowFindings(fromFinish, w, [estimatedFirst, run('back', T0 + 10_000 + 1_800_000)]).map(f => f.code)).toEqual(['window.estimated'])
  })
  it('a 60 min window (the automobile rule): 3600.000 s used is within, 3600.001 s is not', () => {
    const auto = profiles['intl-automobile']
    const ok = evaluateAttempt({ profile: auto, distanceM: KM, runs: [run('out', T0, '10', T0 + 10_000), run('back', T0 + 3_000_000, '10', T0 + 3_600_000)] })
    expect(ok.window.ok).toBe(true)
    const late = evaluateAttempt({ profile: auto, distanceM: KM, runs: [run('out', T0, '10', T0 + 10_000), run('back', T0 + 3_000_000, '10', T0 + 3_600_001)] })
    expect(late.window.ok).toBe(false)
    expect(late.valid).toBe(false)
  })
})

describe('the next-day window of the club procedure, in the event\'s zone', () => {
  // America/Denver is UTC−7 in December: the qualifier at 09:00 local on 4 December is 16:00 UTC.
  const zone = 'America/Denver'
  const qualifier = run('out', Date.parse('2026-12-04T16:00:00Z'))
  const record = (iso: string) => run('out', Date.parse(iso))
  it('opens at local midnight of the next day and closes before 12:00 local', () => {
    const w = evaluateWindow(club, [qualifier], zone)
    // Midnight 5 December local = 07:00 UTC; 12:00 local = 19:00 UTC; the last moment is a millisecond before.
    expect(w.opensMs).toBe(Date.parse('2026-12-05T07:00:00Z'))
    expect(w.deadlineMs).toBe(Date.parse('2026-12-05T19:00:00Z') - 1)
    expect(w.closingAnchor).toBe('start-second')
    expect(evaluateWindow(club, [qualifier, record('2026-12-05T07:00:00.000Z')], zone).ok).toBe(true)
    expect(evaluateWindow(club, [qualifier, record('2026-12-05T06:59:59.999Z')], zone).ok).toBe(false)
    expect(evaluateWindow(club, [qualifier, record('2026-12-05T18:59:59.999Z')], zone).ok).toBe(true)
    expect(evaluateWindow(club, [qualifier, record('2026-12-05T19:00:00.000Z')], zone).ok).toBe(false)
  })
  it('says the record run is not within it', () => {
    const runs = [qualifier, record('2026-12-05T19:00:00.000Z')]
    expect(windowFindings(club, evaluateWindow(club, runs, zone), runs)).toEqual([{ code: 'window.exceeded', severity: 'fail',
      message: 'The record run is not within the window: record run on the calendar day after the qualifying run, at least 6 h after it, leaving before 12:00.',
      rule: expect.objectContaining({ name: 'Time window' }) }])
  })
  it('after a qualifier late in the evening, opens 6 h after it, not at midnight (an overnight impound)', () => {
    // The club's "next morning" read as after an overnight impound of at least 6 h (common practice, our reading).
    // A qualifier at 23:59 local on 4 December (06:59 UTC on the 5th): a record run at 00:01 is not the next
    // morning; the window opens at 05:59 local (12:59 UTC), to the millisecond.
    const late = run('out', Date.parse('2026-12-05T06:59:00Z'))
    expect(evaluateWindow(club, [late], zone).opensMs).toBe(Date.parse('2026-12-05T12:59:00Z'))
    expect(evaluateWindow(club, [late, record('2026-12-05T07:01:00Z')], zone).ok).toBe(false)
    expect(evaluateWindow(club, [late, record('2026-12-05T12:58:59.999Z')], zone).ok).toBe(false)
    expect(evaluateWindow(club, [late, record('2026-12-05T12:59:00.000Z')], zone).ok).toBe(true)
    // A qualifier at 09:00 is more than 6 h before midnight: the window still opens at midnight.
    expect(evaluateWindow(club, [qualifier], zone).opensMs).toBe(Date.parse('2026-12-05T07:00:00Z'))
  })
  it('with no time of day named, the whole next local day', () => {
    const allDay = copyProfile(club, { window: { value: { kind: 'next-day' }, source: 'test rulebook, art. 6', certainty: 'seen' } })
    expect(evaluateWindow(allDay, [qualifier], zone).deadlineMs).toBe(Date.parse('2026-12-06T07:00:00Z') - 1)
    expect(evaluateWindow(allDay, [qualifier, record('2026-12-06T06:59:59.999Z')], zone).ok).toBe(true)
    expect(evaluateWindow(allDay, [qualifier, record('2026-12-06T07:00:00.000Z')], zone).ok).toBe(false)
  })
})

describe('a measured distance against its survey (never shorter; longer within the tolerance)', () => {
  const check = (exitM: string, tol = 10, exitElevation = '0') =>
    checkMeasuredDistance(moto, { positionM: '0', elevationM: '0' }, { positionM: exitM, elevationM: exitElevation }, '1000', tol)
  it('accepts it exactly, and longer by the tolerance; refuses a millimetre more, or any shortfall', () => {
    expect(check('1000')).toMatchObject({ surveyedM: '1000.000', differenceMm: '0', withinTolerance: true, findings: [] })
    expect(check('1000.010')).toMatchObject({ differenceMm: '10', withinTolerance: true })
    expect(check('1000.011').findings).toEqual([{ code: 'course.distance-off-survey', severity: 'fail',
      message: 'The traps are 1000.011 m apart, 11.0 mm longer than the nominal 1000 m; the survey tolerance is 10 mm.' }])
    expect(check('999.9995').findings).toEqual([{ code: 'course.distance-off-survey', severity: 'fail',
      message: 'The traps are 999.999 m apart, 0.5 mm shorter than the nominal 1000 m; a distance shorter than nominal is never accepted, as it inflates the speed.' }])
  })
  it('computes the gradient over the surveyed length: 10 m over 1000 m is 1 %, the motorcycle limit', () => {
    expect(check('1000', 10, '10')).toMatchObject({ gradientPercent: '1.0000', findings: [] })
    expect(check('1000', 10, '10.001').findings.map(f => f.code)).toEqual(['course.gradient-over-limit'])
    expect(check('1000', 10, '-10.001').findings.map(f => f.code)).toEqual(['course.gradient-over-limit'])
    // Traps at one position: no length, no gradient, and the distance refused.
    expect(check('0', 10, '5')).toMatchObject({ gradientPercent: '0.0000', withinTolerance: false })
  })
})
