import { describe, expect, it } from 'vitest'
import { buildRecordBook, type RatifiedResult } from '#shared/rules/record-book'
import { calculate } from '#shared/rules/calculator'

// The record book: one result per attempt and distance (its latest ratified version), the best of a day where the
// profile carries only that forward (FIM rulebook extract, seen), the fastest standing and a tie never displacing the
// holder (common practice: a record is beaten, not equalled). The calculator: the public page's whole answer.
const r = (attemptId: number, kmh: string, order: number, x: Partial<RatifiedResult> = {}): RatifiedResult =>
  ({ attemptId, className: 'Electric, partial', distanceLabel: 'Flying mile', kmh, date: '2026-12-05', bestPerDayOnly: false, order, extra: null, ...x })

describe('the record book at its edges', () => {
  it('takes the latest ratified version of a claim, whatever order they come in', () => {
    const book = buildRecordBook([r(1, '390.000', 2), r(1, '380.000', 1)])
    expect(book.records.map(x => [x.kmh, x.order])).toEqual([['390.000', 2]])
    const older = buildRecordBook([r(1, '380.000', 2), r(1, '390.000', 1)])
    expect(older.records.map(x => x.kmh)).toEqual(['380.000'])
  })
  it('keeps the holder on a tie and lists the holders displaced, the latest first, in ratification order', () => {
    const book = buildRecordBook([r(3, '400.000', 3), r(1, '380.000', 1), r(4, '400.000', 4), r(2, '390.000', 2)])
    expect(book.records).toHaveLength(1)
    expect(book.records[0]!.attemptId).toBe(3)
    expect(book.records[0]!.history.map(h => h.attemptId)).toEqual([2, 1])
  })
  it('carries forward only the best of a day where the profile says so; the earlier of equals is the best', () => {
    const day = { bestPerDayOnly: true }
    const book = buildRecordBook([r(1, '390.000', 1, day), r(2, '395.000', 2, day), r(3, '395.000', 3, day), r(4, '391.000', 4, { ...day, date: '2026-12-06' })])
    expect(book.records[0]!.attemptId).toBe(2)
    expect(book.notCarriedForward.map(x => [x.attemptId, x.bestOfDay.attemptId])).toEqual([[1, 2], [3, 2]])
    // Without the rule, every result goes forward and the fastest stands.
    expect(buildRecordBook([r(1, '390.000', 1), r(2, '395.000', 2)]).notCarriedForward).toEqual([])
  })
  it('orders the book by profile, class and distance; records of different profiles never compare', () => {
    const book = buildRecordBook([
      r(1, '300.000', 1, { profile: 'intl-motorcycle', className: 'B', distanceLabel: 'Flying mile' }),
      r(2, '300.000', 2, { profile: 'intl-motorcycle', className: 'B', distanceLabel: 'Flying kilometre' }),
      r(3, '300.000', 3, { profile: 'club-same-direction', className: 'Z' }),
      r(4, '300.000', 4, { profile: 'intl-motorcycle', className: 'A' }),
      r(5, '500.000', 5, { className: 'A' }),
    ])
    expect(book.records.map(x => x.attemptId)).toEqual([5, 3, 4, 2, 1])
  })
})

describe('the public calculator\'s answer', () => {
  // 1 km in 10.000 s out and 9.000 s back: 360.000 and 400.000 km/h; the mean time 9.5 s → 378.947 km/h
  // (3600 ÷ 9.5 = 378.9473…), 235.466 mph (1000 ÷ 9.5 ÷ 0.44704 = 235.4669…, truncated).
  const req = {
    profile: 'intl-motorcycle' as const,
    distanceM: '1000',
    runs: [
      { direction: 'out' as const, startedAt: '2026-12-05T09:00:00Z', elapsedS: '10.000' },
      { direction: 'back' as const, startedAt: '2026-12-05T09:30:00Z', elapsedS: '9.000' },
    ],
  }
  it('gives every figure as a decimal string, the window\'s close and the profile it used', () => {
    const c = calculate(req)
    expect(c.profile).toEqual({ id: 'intl-motorcycle', version: 1, name: 'International motorcycle', decimals: 3 })
    expect(c.runs).toEqual([
      { direction: 'out', elapsedS: '10.000', speedKmh: '360.000', speedMph: '223.693' },
      { direction: 'back', elapsedS: '9.000', speedKmh: '400.000', speedMph: '248.548' },
    ])
    expect([c.meanTimeS, c.resultKmh, c.resultMph]).toEqual(['9.500', '378.947', '235.466'])
    // 30 min + 9 s from the first start to the (estimated) finish of the second; the close is 2 h after the first start.
    expect(c.window).toEqual({ rule: '120 min from the start of the first run to the finish of the second run', usedS: '1809.000',
      deadline: '2026-12-05T11:00:00.000Z', opens: null })
    expect(c.windowOk).toBe(true)
    expect(c.required).toBeNull()
    expect(c.returnTargetS).toBeNull()
  })
  it('shows a mean time with one more decimal only when it needs it', () => {
    const odd = calculate({ ...req, runs: [req.runs[0]!, { ...req.runs[1]!, elapsedS: '9.001' }] })
    expect(odd.meanTimeS).toBe('9.5005')
    // Times typed to the ten-thousandth: the mean to the ten-thousandth, or one more.
    const fine = calculate({ ...req, runs: [{ ...req.runs[0]!, elapsedS: '10.0001' }, { ...req.runs[1]!, elapsedS: '9.0000' }] })
    expect(fine.runs[0]!.elapsedS).toBe('10.0001')
    expect(fine.meanTimeS).toBe('9.50005')
  })
  it('compares with a record in km/h or in mph, and gives the return target after one run', () => {
    expect(calculate({ ...req, recordKmh: '378.946' }).beatsRecord).toBe(true)
    expect(calculate({ ...req, recordKmh: '378.947' }).beatsRecord).toBe(false)
    expect(calculate({ ...req, recordMph: '235.467' }).required).toEqual({ figure: '235.468', unit: 'mph' })
    // After 10 s, to beat 360 km/h the return takes at most 2 × 1000 ÷ 100.000277… − 10 = 9.99994… → 9.999 s.
    const one = calculate({ ...req, runs: [req.runs[0]!], recordKmh: '360' })
    expect(one.returnTargetS).toBe('9.999')
    expect(one.meanTimeS).toBeNull()
    expect(one.resultKmh).toBeNull()
  })
  it('takes the finish from the entry instant where given', () => {
    const withEntry = calculate({ ...req, runs: [{ ...req.runs[0]!, entryAt: '2026-12-05T09:00:40Z' }, { ...req.runs[1]!, entryAt: '2026-12-05T09:30:40Z' }] })
    // The second run left the distance at 09:30:40 + 9 s: 30 min 49 s after the first start.
    expect(withEntry.window.usedS).toBe('1849.000')
    expect(withEntry.findings.map(f => f.code)).not.toContain('window.estimated')
  })
})
