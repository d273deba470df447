import { beforeEach, describe, expect, it } from 'vitest'
import { evaluateAttempt } from '#shared/rules/attempt'
import { fromDecimal } from '#shared/rules/exact'
import { profiles } from '#shared/rules/profiles'

const MILE = fromDecimal('1609.344') // 1 mile = 1609.344 m exactly (NIST SP 811, appendix B)
const at = (iso: string) => Date.parse(iso)

describe('when the machine must leave the line for the return run', () => {
  // International motorcycle window: the whole attempt, start of the first run to the finish of the second,
  // within 2 h (FIM world records page, seen). Standing record 239.227 mph: the figure to reach is 239.228
  // (exceed the record; figures truncated to 3 decimals, FIM page, seen).
  const first = {
    direction: 'out' as const,
    startedAtMs: at('2026-08-20T10:00:00Z'),
    elapsedS: fromDecimal('15.000'), // a mile in 15 s is 240.000 mph exactly (3600 / 15)
    finishedAtMs: at('2026-08-20T10:01:15Z'), // 60 s from the line to the entry trap, then the mile
  }
  // Computed in each test, never while the tests are collected: a mutant is switched on only inside a test.
  let result: ReturnType<typeof evaluateAttempt>
  beforeEach(() => {
    result = evaluateAttempt({
      profile: profiles['intl-motorcycle'],
      distanceM: MILE,
      runs: [first],
      record: { value: fromDecimal('239.227'), unit: 'mph' },
      timeZone: 'UTC',
    })
  })

  it('takes the run-up and the longest time that still beats the record from the window\'s close', () => {
    // Hand computation (exact fractions): 2 × 1609.344 / (239.228 × 0.44704) − 15 = 15.09681… s, floored to the
    // timing's 3 decimals, 15.096 s. 12:00:00.000 − 60 s − 15.096 s = 11:58:44.904.
    expect(result.returnTargetS && result.leaveBy?.overDistanceS).toBe('15.096')
    expect(result.leaveBy?.runUpS).toBe('60.000')
    expect(result.leaveBy?.deadlineMs).toBe(at('2026-08-20T12:00:00Z'))
    expect(new Date(result.leaveBy!.atMs).toISOString()).toBe('2026-08-20T11:58:44.904Z')
    expect(result.leaveBy?.overDistanceBasis).toBe('record')
    expect(result.leaveBy?.closesAt).toBe('finish')
  })

  it('uses the first run\'s time over the distance where no record stands', () => {
    const open = evaluateAttempt({ profile: profiles['intl-motorcycle'], distanceM: MILE, runs: [first], timeZone: 'UTC' })
    // 12:00:00 − 60 s − 15 s = 11:58:45.
    expect(new Date(open.leaveBy!.atMs).toISOString()).toBe('2026-08-20T11:58:45.000Z')
    expect(open.leaveBy?.overDistanceBasis).toBe('first-run')
  })

  it('says the run-up is unknown when the first run has no instant it left the distance', () => {
    const { finishedAtMs: _, ...noFinish } = first
    const r = evaluateAttempt({ profile: profiles['intl-motorcycle'], distanceM: MILE, runs: [noFinish], timeZone: 'UTC' })
    // The run-up is then taken as zero: 12:00:00 (2 h from the start) less the 15 s over the mile.
    expect(r.leaveBy?.runUpUnknown).toBe(true)
    expect(new Date(r.leaveBy!.atMs).toISOString()).toBe('2026-08-20T11:59:45.000Z')
  })

  it('is the window\'s close itself where the window closes at the return run\'s start', () => {
    // Club procedure: the record run the next morning (club record procedure pages, seen), read as before
    // noon in the event's zone.
    const club = evaluateAttempt({ profile: profiles['club-same-direction'], distanceM: MILE, runs: [first], timeZone: 'UTC' })
    expect(club.leaveBy?.closesAt).toBe('start')
    expect(new Date(club.leaveBy!.atMs).toISOString()).toBe('2026-08-21T11:59:59.999Z')
  })

  it('is gone once the pair is in', () => {
    const back = { ...first, direction: 'back' as const, startedAtMs: at('2026-08-20T11:00:00Z'), finishedAtMs: at('2026-08-20T11:01:15Z') }
    const pair = evaluateAttempt({ profile: profiles['intl-motorcycle'], distanceM: MILE, runs: [first, back], timeZone: 'UTC' })
    expect(pair.leaveBy).toBeNull()
  })
})
