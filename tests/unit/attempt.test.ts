import { beforeEach, describe, expect, it } from 'vitest'
import { calculate } from '#shared/rules/calculator'
import { calculatorRequestSchema } from '#shared/schemas/calculator'
import { evaluateAttempt } from '#shared/rules/attempt'
import { fromDecimal } from '#shared/rules/exact'
import { profiles } from '#shared/rules/profiles'

const MILE = 1609.344
const at = (iso: string) => Date.parse(iso)

describe('two-way result, 1983 flying mile', () => {
  // Source: 1983 land speed record published by the Royal Automobile Club and others: runs of
  // 624.241 and 642.971 mph over the flying mile, official average 633.468 mph; mile times 5.767 s
  // and 5.599 s.
  // Computed in each test, never while the tests are collected: a mutant is switched on only inside a test.
  let res: ReturnType<typeof calculate>
  beforeEach(() => {
    res = calculate({
      profile: 'intl-automobile',
      distanceM: MILE,
      runs: [
        { direction: 'out', startedAt: '1983-10-04T09:00:00Z', elapsedS: '5.767' },
        { direction: 'back', startedAt: '1983-10-04T09:40:00Z', elapsedS: '5.599' },
      ],
    })
  })

  it('gives each run the published figure (truncated)', () => {
    expect(res.runs.map(r => r.speedMph)).toEqual(['624.241', '642.971'])
  })

  it('gives the published two-way average', () => {
    expect(res.meanTimeS).toBe('5.683')
    expect(res.resultMph).toBe('633.468')
  })

  it('is not the arithmetic mean of the speeds (633.606)', () => {
    // Hand computation: 3600 / 5.767 = 624.2413…, 3600 / 5.599 = 642.9719…; their arithmetic mean is 633.6066…,
    // printed as 633.606: the method the 1983 result (Royal Automobile Club, published) did not use.
    expect(res.resultMph).toBe('633.468')
    expect(res.resultMph).not.toBe('633.606')
  })

  it('km/h figures follow from the same exact value', () => {
    // 633.4682… mph × 1.609344 = 1019.4683… km/h (mph to km/h is exact: 0.44704 × 3.6); checked with Python's fractions module.
    expect(res.resultKmh).toBe('1019.468')
    expect(res.windowOk).toBe(true)
  })
})

describe('record margin', () => {
  it('the published case: 633.468 mph clears 622.407 mph under a 1 % margin (automobile profile)', () => {
    // Source: 1983 land speed record, 5.767 s and 5.599 s over the mile, 633.468 mph (Royal Automobile Club,
    // published); the standing record was the 1970 figure of 622.407 mph (widely published). Under the 1 %
    // margin (reported for 1983; from memory), 622.407 × 1.01 = 628.63107 → at least 628.632 mph.
    const res = calculate({
      profile: 'intl-automobile',
      distanceM: MILE,
      runs: [
        { direction: 'out', startedAt: '1983-10-04T09:00:00Z', elapsedS: '5.767' },
        { direction: 'back', startedAt: '1983-10-04T09:30:00Z', elapsedS: '5.599' },
      ],
      recordMph: 622.407,
    })
    expect(res.resultMph).toBe('633.468')
    expect(res.required).toEqual({ figure: '628.632', unit: 'mph' })
    expect(res.beatsRecord).toBe(true)
  })

  it('an invented edge case: 634.05 mph against 630.388 mph is under a 1 % margin (automobile profile)', () => {
    // Invented figures, no published source: ratio 634.05 / 630.388 = 1.0058 < 1.01.
    // Mile times chosen to give 634.0… mph: 3600 / 634.05 = 5.677785… s; the two times average to it.
    const res = calculate({
      profile: 'intl-automobile',
      distanceM: MILE,
      runs: [
        { direction: 'out', startedAt: '1983-10-04T09:00:00Z', elapsedS: '5.6777' },
        { direction: 'back', startedAt: '1983-10-04T09:30:00Z', elapsedS: '5.6778' },
      ],
      recordMph: 630.388,
    })
    expect(res.resultMph!.startsWith('634.0')).toBe(true)
    expect(res.beatsRecord).toBe(false)
    expect(res.required).toEqual({ figure: '636.692', unit: 'mph' }) // 630.388 × 1.01 = 636.69188 → at least 636.692
    expect(res.findings.map(f => f.code)).toContain('record.margin-not-met')
  })

  it('the same figures beat the record under the motorcycle profile (exceed, no margin)', () => {
    // Source: FIM world records page (seen): exceed the standing record; no margin known (from memory).
    const res = calculate({
      profile: 'intl-motorcycle',
      distanceM: MILE,
      runs: [
        { direction: 'out', startedAt: '2026-08-14T09:00:00Z', elapsedS: '5.6777' },
        { direction: 'back', startedAt: '2026-08-14T09:30:00Z', elapsedS: '5.6778' },
      ],
      recordMph: 630.388,
    })
    expect(res.beatsRecord).toBe(true)
    expect(res.required).toEqual({ figure: '630.389', unit: 'mph' })
  })

  it('equal to the standing record is not a record where it must be exceeded', () => {
    // 3600 / 5.6 = 642.857142… mph → 642.857, exactly the record: not exceeded (from memory: "exceed").
    const res = calculate({
      profile: 'intl-motorcycle',
      distanceM: MILE,
      runs: [
        { direction: 'out', startedAt: '2026-08-14T09:00:00Z', elapsedS: '5.6' },
        { direction: 'back', startedAt: '2026-08-14T09:30:00Z', elapsedS: '5.6' },
      ],
      recordMph: 642.857,
    })
    expect(res.resultMph).toBe('642.857')
    expect(res.beatsRecord).toBe(false)
    expect(res.findings.map(f => f.code)).toContain('record.not-beaten')
  })
})

describe('return-run target', () => {
  it('is the longest time that still counts, t2 ≤ 2d / V − t1', () => {
    // Hand computation (mean of times: d / ((t1 + t2) / 2) ≥ V ⇔ t2 ≤ 2d / V − t1). Record 400 km/h over 1 km, first run 9.000 s (400.000 km/h):
    // to exceed, the pair needs ≥ 400.001 km/h, so t2 ≤ 2 × 3.6 / 400.001 h·km… = 17.99995500… − 9 = 8.999955 s
    // → at 1/1000 s, 8.999 s.
    const res = calculate({
      profile: 'intl-motorcycle',
      distanceM: 1000,
      runs: [{ direction: 'out', startedAt: '2026-08-14T09:00:00Z', elapsedS: '9.000' }],
      recordKmh: 400,
    })
    expect(res.resultKmh).toBeNull()
    expect(res.returnTargetS).toBe('8.999')
    // Check the target counts and one tick slower does not.
    const pair = (t2: string) => calculate({
      profile: 'intl-motorcycle', distanceM: 1000, recordKmh: 400,
      runs: [
        { direction: 'out', startedAt: '2026-08-14T09:00:00Z', elapsedS: '9.000' },
        { direction: 'back', startedAt: '2026-08-14T09:40:00Z', elapsedS: t2 },
      ],
    }).beatsRecord
    expect(pair('8.999')).toBe(true)
    expect(pair('9.000')).toBe(false)
  })

  it('says when no return run can reach the target', () => {
    const res = calculate({
      profile: 'intl-motorcycle', distanceM: 1000, recordKmh: 400,
      runs: [{ direction: 'out', startedAt: '2026-08-14T09:00:00Z', elapsedS: '30' }],
    })
    // 2 × 1000 m / (400.001 km/h) = 17.99995… s < 30 s already used.
    expect(res.returnTargetS).toBeNull()
    expect(res.findings.map(f => f.code)).toContain('return.unreachable')
  })
})

describe('time windows, a minute inside and a minute outside', () => {
  const two = (profile: 'intl-motorcycle' | 'intl-automobile' | 'club-same-direction', second: string, elapsed = '30', directions: ['out' | 'back', 'out' | 'back'] = ['out', 'back'], timeZone?: string) =>
    calculate({
      profile, distanceM: 1000, timeZone,
      runs: [
        { direction: directions[0], startedAt: '2026-08-14T09:00:00Z', elapsedS: '30' },
        { direction: directions[1], startedAt: second, elapsedS: elapsed },
      ],
    })

  it('international motorcycle: start of the first to finish of the second within 2 h', () => {
    // Source: FIM world records page (seen): the whole attempt within 2 h.
    expect(two('intl-motorcycle', '2026-08-14T10:58:30Z').windowOk).toBe(true) // finishes 10:59:00
    expect(two('intl-motorcycle', '2026-08-14T11:00:30Z').windowOk).toBe(false) // finishes 11:01:00
    expect(two('intl-motorcycle', '2026-08-14T11:00:30Z').findings.map(f => f.code)).toContain('window.exceeded')
  })

  it('international automobile: 60 min, default anchors start of first to finish of second', () => {
    // Source: FIA International Sporting Code, Appendix D as reported (runs 61 min apart were refused).
    expect(two('intl-automobile', '2026-08-14T09:58:30Z').windowOk).toBe(true) // finishes 09:59:00
    expect(two('intl-automobile', '2026-08-14T10:00:30Z').windowOk).toBe(false) // finishes 10:01:00
  })

  it('club: the record run on the next morning in the event time zone', () => {
    // Source: club record procedure pages (seen): record run the next morning; "morning" read as before noon
    // (our reading, held in the profile with its source).
    const same = ['out', 'out'] as ['out', 'out']
    expect(two('club-same-direction', '2026-08-15T00:01:00Z', '30', same).windowOk).toBe(true)
    expect(two('club-same-direction', '2026-08-15T11:59:00Z', '30', same).windowOk).toBe(true)
    expect(two('club-same-direction', '2026-08-15T12:00:00Z', '30', same).windowOk).toBe(false)
    expect(two('club-same-direction', '2026-08-15T23:59:00Z', '30', same).windowOk).toBe(false)
    expect(two('club-same-direction', '2026-08-14T23:59:00Z', '30', same).windowOk).toBe(false)
    expect(two('club-same-direction', '2026-08-16T00:01:00Z', '30', same).windowOk).toBe(false)
    // In a time zone 6 h behind UTC (America/Denver in August, UTC−6), the first run is on 14 August
    // at 03:00 local; the next local day runs from 2026-08-15T06:00Z.
    expect(two('club-same-direction', '2026-08-15T05:59:00Z', '30', same, 'America/Denver').windowOk).toBe(false)
    expect(two('club-same-direction', '2026-08-15T06:01:00Z', '30', same, 'America/Denver').windowOk).toBe(true)
  })
})

describe('pairing', () => {
  it('flags two runs the same way under an opposite-direction profile', () => {
    const res = calculate({
      profile: 'intl-motorcycle', distanceM: 1000,
      runs: [
        { direction: 'out', startedAt: '2026-08-14T09:00:00Z', elapsedS: '10' },
        { direction: 'out', startedAt: '2026-08-14T09:30:00Z', elapsedS: '10' },
      ],
    })
    expect(res.findings.find(f => f.code === 'pair.direction')?.rule?.source).toMatch(/FIM world records page/)
  })

  it('mean of speeds only where a profile says so', () => {
    const profile = { ...profiles['club-same-direction'], averaging: { ...profiles['club-same-direction'].averaging, value: 'mean-of-speeds' as const } }
    const r = evaluateAttempt({
      profile, distanceM: fromDecimal('1609.344'),
      runs: [
        { direction: 'out', startedAtMs: at('2026-08-14T09:00:00Z'), elapsedS: fromDecimal('5.767') },
        { direction: 'out', startedAtMs: at('2026-08-15T08:00:00Z'), elapsedS: fromDecimal('5.599') },
      ],
    })
    // Hand computation: arithmetic mean of 624.2413… and 642.9719… = 633.6066… mph, printed 633.606.
    expect(r.result!.mph).toBe('633.606')
  })
})

describe('validity is one answer', () => {
  // Each run entered the mile a minute after leaving the line: the window is decided, not estimated.
  const pair = (directions: ['out' | 'back', 'out' | 'back'], recordMph: number) => calculate({
    profile: 'intl-motorcycle',
    distanceM: MILE,
    runs: [
      { direction: directions[0], startedAt: '2026-08-14T09:00:00Z', entryAt: '2026-08-14T09:01:00Z', elapsedS: '5.6' },
      { direction: directions[1], startedAt: '2026-08-14T09:30:00Z', entryAt: '2026-08-14T09:31:00Z', elapsedS: '5.6' },
    ],
    recordMph,
  })

  it('a pair against its profile is not valid and beats no record, whatever its speed', () => {
    // Hand computation: 3600 / 5.6 = 642.857… mph, well over a record of 600 mph; but both runs went
    // out, and the international motorcycle profile needs one run each way (its "Runs" rule, with its source).
    const res = pair(['out', 'out'], 600)
    expect(res.resultMph).toBe('642.857')
    expect(res.valid).toBe(false)
    expect(res.beatsRecord).toBe(false)
    expect(res.findings.map(f => f.code)).toContain('pair.direction')
  })

  it('a valid pair that does not beat the record is still valid', () => {
    // Hand computation: 642.857 mph against a record of 650 mph.
    const res = pair(['out', 'back'], 650)
    expect(res.valid).toBe(true)
    expect(res.beatsRecord).toBe(false)
    expect(pair(['out', 'back'], 600)).toMatchObject({ valid: true, beatsRecord: true, cannotDecide: [] })
  })
})

describe('what the calculator cannot decide', () => {
  const runs = (entry: boolean) => [
    { direction: 'out' as const, startedAt: '2026-08-14T09:00:00Z', elapsedS: '9', ...(entry ? { entryAt: '2026-08-14T09:01:00Z' } : {}) },
    { direction: 'back' as const, startedAt: '2026-08-14T09:30:00Z', elapsedS: '9', ...(entry ? { entryAt: '2026-08-14T09:31:00Z' } : {}) },
  ]
  it('is not valid without the entry instants: the window is only estimated, and it says so', () => {
    const res = calculate({ profile: 'intl-motorcycle', distanceM: 1000, runs: runs(false) })
    // 1000 m / 9 s × 3.6 = 400 km/h exactly: the figures are computed all the same.
    expect(res.resultKmh).toBe('400.000')
    expect(res.valid).toBe(false)
    expect(res.cannotDecide).toEqual(['the time window: without the instant each run entered the measured distance, '
      + 'its finish is only estimated (give each run\'s entry instant)'])
    expect(calculate({ profile: 'intl-motorcycle', distanceM: 1000, runs: runs(true) })).toMatchObject({ valid: true, cannotDecide: [] })
  })
  it('gives no verdict for a distance the profile does not list, nor for one a millimetre off', () => {
    // The international automobile profile lists the flying kilometre and mile (its distances rule): 1234 m is neither.
    const res = calculate({ profile: 'intl-automobile', distanceM: 1234, runs: runs(true) })
    expect(res.valid).toBe(false)
    expect(res.cannotDecide).toHaveLength(1)
    expect(res.cannotDecide[0]).toBe(`whether it counts: 1234.000 m is not a distance of the profile, which lists ${profiles['intl-automobile'].distances.value.map(d => `${d.label} (${d.metres} m)`).join(', ')}`)
    expect(res.cannotDecide[0]).toMatch(/^whether it counts: 1234\.000 m is not a distance of the profile, which lists .*\(1000 m\).*\(1609\.344 m\)/)
    expect(calculate({ profile: 'intl-automobile', distanceM: 1000.001, runs: runs(true) }).cannotDecide).toHaveLength(1)
    expect(calculate({ profile: 'intl-automobile', distanceM: 1000, runs: runs(true) }).cannotDecide).toEqual([])
  })
})

describe('the finish of a run', () => {
  // Automobile profile: 60 min from the start of the first run to the finish of the second (its window rule).
  const at = (iso: string) => Date.parse(iso)
  const runs = (finishedAtMs?: number) => evaluateAttempt({
    profile: profiles['intl-automobile'],
    distanceM: fromDecimal('1609.344'),
    runs: [
      { direction: 'out', startedAtMs: at('2026-08-14T09:00:00Z'), elapsedS: fromDecimal('20') },
      { direction: 'back', startedAtMs: at('2026-08-14T09:59:00Z'), elapsedS: fromDecimal('20'), finishedAtMs },
    ],
  })

  it('is the instant the run left the measured distance, run-up included', () => {
    // Hand computation: leaving the line at 09:59:00 with a 75 s run-up and a 20 s mile, the run leaves the
    // mile at 10:00:35, after the window that closed at 10:00:00.
    const res = runs(at('2026-08-14T10:00:35Z'))
    expect(res.window.ok).toBe(false)
    expect(res.valid).toBe(false)
    expect(res.findings.map(f => f.code)).toContain('window.exceeded')
  })

  it('without the readings, is estimated as start plus time over the distance, and says so', () => {
    // 09:59:00 + 20 s = 09:59:20: within the window, but only as an estimate.
    const res = runs()
    expect(res.window.ok).toBe(true)
    expect(res.findings.map(f => [f.code, f.severity])).toContainEqual(['window.estimated', 'warn'])
  })
})

describe('the public calculator takes the entry-trap instant and exact decimals', () => {
  const request = (entryAt?: string) => calculatorRequestSchema.parse({
    profile: 'intl-automobile',
    distanceM: '1609.344',
    runs: [
      { direction: 'out', startedAt: '2026-08-14T09:00:00Z', elapsedS: '20' },
      { direction: 'back', startedAt: '2026-08-14T09:59:00Z', elapsedS: '20', ...(entryAt ? { entryAt } : {}) },
    ],
  })

  it('finishes a run at its entry-trap instant plus the time over the distance', () => {
    // Hand computation (the issue's case): run 2 leaves the line at 09:59:00, crosses the entry trap after a
    // 75 s run-up at 10:00:15, and leaves the mile 20 s later at 10:00:35, after the 60 min window (FIA
    // Appendix D as reported: 60 min; anchors start of the first run to the finish of the second).
    const late = calculate(request('2026-08-14T10:00:15Z'))
    expect(late.windowOk).toBe(false)
    expect(late.valid).toBe(false)
    expect(late.findings.map(f => f.code)).not.toContain('window.estimated')
    // Crossing the entry trap at 09:59:39.5 leaves the mile at 09:59:59.5: inside.
    expect(calculate(request('2026-08-14T09:59:39.5Z')).windowOk).toBe(true)
  })

  it('without it, estimates the finish and says the window is estimated', () => {
    const res = calculate(request())
    expect(res.windowOk).toBe(true)
    expect(res.findings.map(f => [f.code, f.severity])).toContainEqual(['window.estimated', 'warn'])
  })

  it('takes every decimal as a string or a number, the exact decimal counting', () => {
    // 1983 flying mile (Royal Automobile Club, published): 5.767 s and 5.599 s → 633.468 mph; the standing
    // record 622.407 mph (1970, widely published) is the same given as text or as a number.
    const runs = [
      { direction: 'out', startedAt: '1983-10-04T09:00:00Z', elapsedS: 5.767 },
      { direction: 'back', startedAt: '1983-10-04T09:40:00Z', elapsedS: '5.599' },
    ]
    const asText = calculate(calculatorRequestSchema.parse({
      profile: 'intl-automobile', distanceM: '1609.344', runs, recordMph: '622.407',
    }))
    const asNumbers = calculate(calculatorRequestSchema.parse({
      profile: 'intl-automobile', distanceM: 1609.344, runs, recordMph: 622.407,
    }))
    expect(asText.resultMph).toBe('633.468')
    expect(asText.required).toEqual({ figure: '628.632', unit: 'mph' })
    expect(asNumbers).toEqual(asText)
    const bad = calculatorRequestSchema.safeParse({ profile: 'intl-automobile', distanceM: '1 mile', runs })
    expect(bad.success).toBe(false)
    expect(bad.error!.issues[0]!.path).toEqual(['distanceM'])
  })
})

describe('the club procedure', () => {
  // Source: club record procedure pages (seen): the qualifying run must itself exceed the standing record; the
  // machine goes into impound within 1 h of its time slip; the record run is the next morning.
  const profile = profiles['club-same-direction']
  const qualifier = (elapsedS: string) => ({ direction: 'out' as const, startedAtMs: at('2026-08-14T09:00:00Z'), elapsedS: fromDecimal(elapsedS), finishedAtMs: at('2026-08-14T09:01:00Z') })
  const recordRun = { direction: 'out' as const, startedAtMs: at('2026-08-15T08:00:00Z'), elapsedS: fromDecimal('8.9') }
  const record = { value: fromDecimal('400.000'), unit: 'km/h' as const }

  it('fails a qualifying run that does not beat the standing record, and the pair with it', () => {
    // Hand computation: 1000 m in 9.000 s is 400.000 km/h exactly (1 km/h = 1/3.6 m/s), equal to the record:
    // not beaten. In 8.999 s it is 400.044… km/h → 400.044, over it.
    const equal = evaluateAttempt({ profile, distanceM: fromDecimal('1000'), runs: [qualifier('9.000')], record })
    expect(equal.findings.map(f => [f.code, f.severity])).toContainEqual(['qualifier.not-over-record', 'fail'])
    expect(equal.findings.find(f => f.code === 'qualifier.not-over-record')!.rule!.source).toMatch(/club record procedure/)
    const pair = evaluateAttempt({ profile, distanceM: fromDecimal('1000'), runs: [qualifier('9.000'), recordRun], record })
    expect(pair.valid).toBe(false)
    expect(pair.beatsRecord).toBe(false)
    const over = evaluateAttempt({ profile, distanceM: fromDecimal('1000'), runs: [qualifier('8.999'), recordRun], record })
    expect(over.findings.map(f => f.code)).not.toContain('qualifier.not-over-record')
    expect(over.valid).toBe(true)
    expect(over.beatsRecord).toBe(true)
  })

  it('checks the impound check-in against 1 h from the qualifying run\'s time slip', () => {
    const run = (impoundCheckInMs: number | null | undefined, runs = [qualifier('8.999'), recordRun]) =>
      evaluateAttempt({ profile, distanceM: fromDecimal('1000'), runs, record, impoundCheckInMs, timeZone: 'UTC' })
    // The qualifying run left the distance at 09:01:00; the limit is 10:01:00.
    expect(run(at('2026-08-14T10:01:00Z')).findings.map(f => f.code).filter(c => c.startsWith('impound'))).toEqual([])
    const late = run(at('2026-08-14T10:02:00Z'))
    expect(late.findings.map(f => [f.code, f.severity])).toContainEqual(['impound.late', 'fail'])
    expect(late.valid).toBe(false)
    expect(run(null).findings.map(f => [f.code, f.severity])).toContainEqual(['impound.missing', 'fail'])
    const waiting = run(null, [qualifier('8.999')])
    expect(waiting.impoundDeadlineMs).toBe(at('2026-08-14T10:01:00Z'))
    expect(waiting.findings.find(f => f.code === 'impound.awaiting')!.message).toContain('2026-08-14 10:01:00 (UTC)')
    // Not tracked (the public calculator): nothing said.
    expect(run(undefined).findings.map(f => f.code).filter(c => c.startsWith('impound'))).toEqual([])
  })

  it('the public calculator checks the qualifier against the record and the next morning', () => {
    const res = calculate({
      profile: 'club-same-direction', distanceM: '1000', recordKmh: '400',
      runs: [
        { direction: 'out', startedAt: '2026-08-14T09:00:00Z', elapsedS: '9.000' },
        { direction: 'out', startedAt: '2026-08-15T13:00:00Z', elapsedS: '8.9' },
      ],
    })
    expect(res.findings.map(f => f.code)).toEqual(expect.arrayContaining(['qualifier.not-over-record', 'window.exceeded']))
    expect(res.valid).toBe(false)
  })
})
