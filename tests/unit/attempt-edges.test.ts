import { describe, expect, it } from 'vitest'
import { evaluateAttempt, returnTarget, type AttemptInput, type RunInput } from '#shared/rules/attempt'
import { fromDecimal, q, toFixed } from '#shared/rules/exact'
import { copyProfile, profiles } from '#shared/rules/profiles'

// The pair and the record at their edges, worked by hand over a kilometre (1000 m): 10 s is 100 m/s = 360 km/h;
// 5 s is 200 m/s = 720 km/h. International rules: two runs in opposite directions, the distance over the mean of the
// times (FIM and FIA, seen); the club's: both the same way, and which average is not settled.
const KM = fromDecimal('1000')
const T0 = Date.parse('2026-12-05T08:00:00Z')
const run = (direction: 'out' | 'back', startS: number, elapsedS: string): RunInput =>
  ({ direction, startedAtMs: T0 + startS * 1000, elapsedS: fromDecimal(elapsedS) })
const moto = profiles['intl-motorcycle']
const auto = profiles['intl-automobile']
const club = profiles['club-same-direction']
const evaluate = (x: Partial<AttemptInput> & { runs: RunInput[] }) =>
  evaluateAttempt({ profile: moto, distanceM: KM, timeZone: 'UTC', ...x })
const codes = (r: ReturnType<typeof evaluate>) => r.findings.map(f => f.code)

describe('the pair', () => {
  it('needs a run', () => {
    expect(() => evaluate({ runs: [] })).toThrow('an attempt needs at least one run')
  })
  it('waits for the run that completes it, saying which', () => {
    const one = evaluate({ runs: [run('out', 0, '10')] })
    expect(one.findings.find(f => f.code === 'pair.awaiting-return')).toMatchObject({ severity: 'info',
      message: 'One run so far: the return run in the opposite direction completes the pair.',
      rule: { name: 'Runs', value: '2, opposite directions', source: moto.runs.source, certainty: 'seen' } })
    const clubOne = evaluate({ profile: club, runs: [run('out', 0, '10')] })
    expect(clubOne.findings.find(f => f.code === 'pair.awaiting-return')!.message)
      .toBe('One run so far: the record run in the same direction completes the pair.')
    expect(one.result).toBeNull()
    expect(one.meanTimeS).toBeNull()
  })
  it('fails two runs the same way under the international rules, and opposite ways under the club\'s', () => {
    const same = evaluate({ runs: [run('out', 0, '10'), run('out', 1200, '10')] })
    expect(same.findings.find(f => f.code === 'pair.direction')).toMatchObject({ severity: 'fail',
      message: 'Both runs went the same way; the profile needs one run in each direction.' })
    expect(same.valid).toBe(false)
    expect(codes(evaluate({ runs: [run('out', 0, '10'), run('back', 1200, '10')] }))).not.toContain('pair.direction')
    const clubOpposite = evaluate({ profile: club, runs: [run('out', 0, '10'), run('back', 86_400, '10')] })
    expect(clubOpposite.findings.find(f => f.code === 'pair.direction')!.message)
      .toBe('The runs went in opposite directions; the profile needs both in the same direction.')
  })
  it('takes the runs in the order they started, whatever order they come in', () => {
    const r = evaluate({ runs: [run('back', 1200, '5'), run('out', 0, '10')] })
    expect(r.runs.map(x => x.direction)).toEqual(['out', 'back'])
    expect(r.runs.map(x => x.kmh)).toEqual(['360.000', '720.000'])
  })
  it('refuses a second run that starts before the first finished; starting at its finish is fine', () => {
    // The first run: 10 s over the distance from its start, so it finishes at T0 + 10 s (estimated).
    const overlap = evaluate({ runs: [run('out', 0, '10'), { ...run('back', 0, '10'), startedAtMs: T0 + 9999 }] })
    expect(overlap.findings.find(f => f.code === 'pair.overlap')).toEqual({ code: 'pair.overlap', severity: 'fail',
      message: 'The second run starts before the first one finished: check the start times.' })
    expect(overlap.valid).toBe(false)
    expect(codes(evaluate({ runs: [run('out', 0, '10'), { ...run('back', 0, '10'), startedAtMs: T0 + 10_000 }] })))
      .not.toContain('pair.overlap')
  })
})

describe('the average', () => {
  it('is the distance over the mean of the times: 1000 m over (10 + 5) / 2 s = 133.333 m/s = 480 km/h', () => {
    const r = evaluate({ runs: [run('out', 0, '10'), run('back', 1200, '5')] })
    expect(toFixed(r.meanTimeS!, 3)).toBe('7.500')
    expect(r.result!.kmh).toBe('480.000')
    expect(r.result!.mph).toBe('298.258') // 480 ÷ 1.609344 = 298.2582…
  })
  it('or the mean of the speeds where a profile says so: (360 + 720) / 2 = 540 km/h', () => {
    const speeds = copyProfile(moto, { averaging: { value: 'mean-of-speeds', source: 'test rulebook, art. 3', certainty: 'seen' } })
    const r = evaluate({ profile: speeds, runs: [run('out', 0, '10'), run('back', 1200, '5')] })
    expect(r.result!.kmh).toBe('540.000')
    expect(codes(r)).not.toContain('averaging.not-settled')
  })
  it('says which average it took where the profile leaves it not settled (the club\'s)', () => {
    const r = evaluate({ profile: club, runs: [run('out', 0, '10'), run('out', 86_400, '5')] })
    expect(r.findings.find(f => f.code === 'averaging.not-settled')).toMatchObject({ severity: 'info',
      message: 'The result is the distance over the mean of the two times; the rulebook in force decides which average applies.',
      rule: { name: 'Result', value: 'mean-of-times', certainty: 'not settled' } })
    const bySpeeds = copyProfile(club, { averaging: { ...club.averaging, value: 'mean-of-speeds' } })
    expect(evaluate({ profile: bySpeeds, runs: [run('out', 0, '10'), run('out', 86_400, '5')] })
      .findings.find(f => f.code === 'averaging.not-settled')!.message)
      .toBe('The result is the mean of the two speeds; the rulebook in force decides which average applies.')
  })
})

describe('against the standing record, at its edges', () => {
  const pair = [run('out', 0, '10'), run('back', 1200, '10')] // 360.000 km/h
  it('must exceed it under the motorcycle rule: 360.000 over 359.999 counts, over 360.000 it does not', () => {
    const beats = evaluate({ runs: pair, record: { value: fromDecimal('359.999'), unit: 'km/h' } })
    expect(beats.beatsRecord).toBe(true)
    expect(beats.required!.text).toBe('360.000')
    const equal = evaluate({ runs: pair, record: { value: fromDecimal('360'), unit: 'km/h' } })
    expect(equal.beatsRecord).toBe(false)
    expect(equal.required!.text).toBe('360.001')
    expect(equal.findings.find(f => f.code === 'record.not-beaten')).toMatchObject({ severity: 'fail',
      message: '360.000 km/h does not beat the standing record of 360.000 km/h.',
      rule: { name: 'Improvement needed', value: 'exceed the standing record' } })
    // Not beating the record is no failure of the pair itself.
    expect(equal.valid).toBe(true)
    expect(equal.meetsImprovement).toBe(false)
  })
  it('needs 1 % more under the automobile rule, reached exactly: 356.436 km/h × 1.01 = 360.000 36 → 360.001', () => {
    const r = evaluate({ profile: auto, runs: pair, record: { value: fromDecimal('356.436'), unit: 'km/h' } })
    expect(r.required!.text).toBe('360.001')
    expect(r.findings.find(f => f.code === 'record.margin-not-met')).toMatchObject({
      message: '360.000 km/h is over the standing record of 356.436 km/h but not by the margin: at least 360.001 km/h is needed.',
      rule: { value: 'at least 1 % over the standing record' } })
    // 356.435 × 1.01 = 359.99935 → 360.000 needed, reached exactly.
    expect(evaluate({ profile: auto, runs: pair, record: { value: fromDecimal('356.435'), unit: 'km/h' } }).beatsRecord).toBe(true)
  })
  it('compares in the record\'s unit: 360 km/h is 223.693 mph (truncated)', () => {
    expect(evaluate({ runs: pair, record: { value: fromDecimal('223.692'), unit: 'mph' } }).beatsRecord).toBe(true)
    expect(evaluate({ runs: pair, record: { value: fromDecimal('223.693'), unit: 'mph' } }).beatsRecord).toBe(false)
  })
  it('a vacant class\'s minimum is reached, not exceeded', () => {
    const at = evaluate({ runs: pair, record: { value: fromDecimal('360'), unit: 'km/h', minimum: true } })
    expect(at.beatsRecord).toBe(true)
    const under = evaluate({ runs: pair, record: { value: fromDecimal('360.001'), unit: 'km/h', minimum: true } })
    expect(under.findings.find(f => f.code === 'record.minimum-not-reached')).toEqual({ code: 'record.minimum-not-reached', severity: 'fail',
      message: '360.000 km/h does not reach the minimum of 360.001 km/h set for this vacant class.',
      rule: { name: 'Vacant class', value: 'a first record must reach the minimum the organiser set',
        source: 'the organiser\'s minimum for the vacant class', certainty: 'common practice' } })
  })
  it('rounds where a profile rounds: 359.99953 km/h is published 360.000', () => {
    const rounding = copyProfile(moto, { figures: { value: { decimals: 3, rounding: 'round' }, source: 'test rulebook, art. 4', certainty: 'seen' } })
    // 1000 m in 10.000013 s = 3600 ÷ 10.000013 = 359.99953… km/h: truncated 359.999, rounded 360.000.
    const slow = [run('out', 0, '10.000013'), run('back', 1200, '10.000013')]
    expect(evaluate({ runs: slow }).result!.kmh).toBe('359.999')
    expect(evaluate({ profile: rounding, runs: slow }).result!.kmh).toBe('360.000')
    expect(evaluate({ profile: rounding, runs: slow, record: { value: fromDecimal('359.999'), unit: 'km/h' } }).beatsRecord).toBe(true)
    expect(evaluate({ runs: slow, record: { value: fromDecimal('359.999'), unit: 'km/h' } }).beatsRecord).toBe(false)
  })
})

describe('the return run\'s target after one run', () => {
  it('is the longest time that still reaches the figure needed: 2d / v − t1, floored to the timing', () => {
    // Needed 360.001 km/h = 100.000277… m/s over 1000 m after 10 s: 2000 / 100.000277… − 10 = 9.99994… → 9.999 s.
    const r = evaluate({ runs: [run('out', 0, '10')], record: { value: fromDecimal('360'), unit: 'km/h' } })
    expect(toFixed(r.returnTargetS!, 3)).toBe('9.999')
    const tenth = evaluate({ runs: [run('out', 0, '10')], record: { value: fromDecimal('360'), unit: 'km/h' }, timeDecimals: 4 })
    expect(toFixed(tenth.returnTargetS!, 4)).toBe('9.9999')
  })
  it('warns when no return run can lift the result, naming the first run in the record\'s unit', () => {
    // After 1000 s (3.6 km/h), 2000 / 100 − 1000 < 0: no return time reaches 360 km/h.
    const r = evaluate({ runs: [run('out', 0, '1000')], record: { value: fromDecimal('223.693'), unit: 'mph' } })
    expect(r.returnTargetS).toBeNull()
    expect(r.findings.find(f => f.code === 'return.unreachable')).toMatchObject({ severity: 'warn',
      message: 'No return run can lift the result to 223.694 mph after a first run at 2.236 mph.' })
    const kmh = evaluate({ runs: [run('out', 0, '1000')], record: { value: fromDecimal('360'), unit: 'km/h' } })
    expect(kmh.findings.find(f => f.code === 'return.unreachable')!.message)
      .toBe('No return run can lift the result to 360.001 km/h after a first run at 3.600 km/h.')
  })
  it('under the mean of speeds: d / (2v − v1), none when the first run alone is fast enough', () => {
    const speeds = copyProfile(moto, { averaging: { value: 'mean-of-speeds', source: 'test rulebook, art. 3', certainty: 'seen' } })
    // Needed 150 m/s after a first run at 100 m/s: the return at 200 m/s, 1000 / 200 = 5 s.
    expect(toFixed(returnTarget(speeds, KM, { elapsedS: q(10n), speedMs: q(100n) }, q(150n), 3)!, 3)).toBe('5.000')
    // Needed 50 m/s after 100 m/s: 2 × 50 − 100 = 0, any time would do: no target.
    expect(returnTarget(speeds, KM, { elapsedS: q(10n), speedMs: q(100n) }, q(50n), 3)).toBeNull()
    expect(returnTarget(speeds, KM, { elapsedS: q(10n), speedMs: q(100n) }, q(49n), 3)).toBeNull()
  })
})

describe('the club\'s qualifying run must itself beat the record', () => {
  const record = { value: fromDecimal('360'), unit: 'km/h' as const }
  it('fails a qualifier at the record, passes one a thousandth over', () => {
    const at = evaluate({ profile: club, runs: [run('out', 0, '10')], record })
    expect(at.findings.find(f => f.code === 'qualifier.not-over-record')).toMatchObject({ severity: 'fail',
      message: 'The qualifying run at 360.000 km/h does not beat the standing record of 360.000 km/h (at least 360.001 km/h '
        + 'needed): no record run may follow it; the entry qualifies again.',
      rule: { name: 'Qualifying run', value: 'the qualifying run must itself beat the standing record', certainty: 'seen' } })
    // 1000 m in 9.99997 s = 360.00108 km/h → 360.001.
    expect(codes(evaluate({ profile: club, runs: [run('out', 0, '9.99997')], record }))).not.toContain('qualifier.not-over-record')
    // With no record, or under the international rules, there is no qualifier to judge.
    expect(codes(evaluate({ profile: club, runs: [run('out', 0, '10')] }))).not.toContain('qualifier.not-over-record')
    expect(codes(evaluate({ runs: [run('out', 0, '10')], record }))).not.toContain('qualifier.not-over-record')
  })
})
