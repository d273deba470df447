import { describe, expect, it } from 'vitest'
import { buildRecordBook, type RatifiedResult } from '#shared/rules/record-book'

let order = 0
const result = (attemptId: number, kmh: string, date: string, bestPerDayOnly = true): RatifiedResult<string> => ({
  attemptId,
  className: 'Electric, fully streamlined',
  distanceLabel: 'Flying mile',
  kmh,
  date,
  bestPerDayOnly,
  order: order++,
  extra: `attempt ${attemptId}`,
})

describe('the record book', () => {
  it('carries forward only the best result per class each day where the profile says so', () => {
    // Source: FIM rulebook extract (seen): only the best result per class each day goes forward.
    const book = buildRecordBook([
      result(1, '401.000', '2026-08-14'),
      result(2, '405.500', '2026-08-14'),
      result(3, '403.000', '2026-08-15'),
    ])
    expect(book.records.map(r => r.attemptId)).toEqual([2])
    expect(book.notCarriedForward.map(r => [r.attemptId, r.bestOfDay.attemptId])).toEqual([[1, 2]])
  })

  it('carries every result forward under a profile without that rule', () => {
    const book = buildRecordBook([result(1, '401.000', '2026-08-14', false), result(2, '405.500', '2026-08-14', false)])
    expect(book.records.map(r => r.attemptId)).toEqual([2])
    expect(book.notCarriedForward).toEqual([])
  })

  it('keeps the holders a record displaced, the latest first, and never a result that held nothing', () => {
    // Common practice of record books: each holder in turn, with its figure; a slower later result never held it.
    const book = buildRecordBook([
      result(1, '390.000', '2026-08-12', false),
      result(2, '395.250', '2026-08-13', false),
      result(3, '392.000', '2026-08-14', false),
      result(4, '401.000', '2026-08-15', false),
    ])
    expect(book.records.map(r => r.attemptId)).toEqual([4])
    expect(book.records[0]!.history.map(r => [r.attemptId, r.kmh])).toEqual([[2, '395.250'], [1, '390.000']])
  })

  it('never lets a tie displace the holder', () => {
    // Common practice: a record must be exceeded, so an equal figure leaves the earlier holder in the book.
    const book = buildRecordBook([result(1, '405.500', '2026-08-14', false), result(2, '405.500', '2026-08-15', false)])
    expect(book.records.map(r => r.attemptId)).toEqual([1])
  })

  it('reads one result per attempt, its latest ratified version', () => {
    const book = buildRecordBook([result(1, '401.000', '2026-08-14'), { ...result(1, '400.900', '2026-08-14') }])
    expect(book.records.map(r => r.kmh)).toEqual(['400.900'])
  })

  it('keeps one result per attempt and distance: one pass claims the kilometre and the mile', () => {
    // Common practice: several traps along one course let one pass yield several distances; each is its own record
    // (the international motorcycle and automobile record lists publish the kilometre and the mile separately).
    const km = { ...result(1, '402.100', '2026-08-14'), distanceLabel: 'Flying kilometre' }
    const book = buildRecordBook([result(1, '401.000', '2026-08-14'), km])
    expect(book.records.map(r => [r.distanceLabel, r.kmh])).toEqual([['Flying kilometre', '402.100'], ['Flying mile', '401.000']])
    expect(book.notCarriedForward).toEqual([])
  })

  it('never compares records kept under different rule profiles', () => {
    // Common practice: a club record and an international record of the same class and distance are separate books.
    const club = { ...result(2, '450.000', '2026-08-14', false), profile: 'Club, two runs same direction' }
    const book = buildRecordBook([{ ...result(1, '401.000', '2026-08-14', false), profile: 'International motorcycle' }, club])
    expect(book.records.map(r => [r.profile, r.kmh])).toEqual([['Club, two runs same direction', '450.000'], ['International motorcycle', '401.000']])
    expect(book.records.every(r => r.history.length === 0)).toBe(true)
  })
})
