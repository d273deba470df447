import { describe, expect, it } from 'vitest'
import { assignPassings, type CandidateRun } from '#shared/rules/device-file'
import { nearestTimeOfDay, onDate, wallClockInstants } from '#shared/rules/zoned'

// Wall-clock times on the days the clocks change, by the IANA time zone database (the platform's Intl data):
// America/Denver goes back 02:00 MDT (UTC-6) → 01:00 MST (UTC-7) on 1 November 2026 and forward 02:00 MST → 03:00 MDT
// on 8 March 2026; Europe/Paris forward 02:00 CET → 03:00 CEST on 29 March 2026, back 03:00 CEST → 02:00 CET on
// 25 October 2026; Australia/Lord_Howe moves by 30 min: back 02:00 (UTC+11) → 01:30 (UTC+10:30) on 5 April 2026,
// forward 02:00 → 02:30 on 4 October 2026.
const iso = (list: number[]) => list.map(t => new Date(t).toISOString())
const HOUR = 3_600_000

describe('the instants a wall-clock time names', () => {
  it('are two in the hour repeated when the clocks go back, earliest first', () => {
    expect(iso(wallClockInstants('2026-11-01T01:30', 'America/Denver'))).toEqual(['2026-11-01T07:30:00.000Z', '2026-11-01T08:30:00.000Z'])
    expect(iso(wallClockInstants('2026-10-25T02:30', 'Europe/Paris'))).toEqual(['2026-10-25T00:30:00.000Z', '2026-10-25T01:30:00.000Z'])
    // 30 min repeated on Lord Howe: 01:45 is 14:45Z at UTC+11, then 15:15Z at UTC+10:30.
    expect(iso(wallClockInstants('2026-04-05T01:45', 'Australia/Lord_Howe'))).toEqual(['2026-04-04T14:45:00.000Z', '2026-04-04T15:15:00.000Z'])
  })
  it('are none in the hour skipped when they go forward, and one either side of it', () => {
    expect(wallClockInstants('2026-03-08T02:30', 'America/Denver')).toEqual([])
    expect(wallClockInstants('2026-03-29T02:00', 'Europe/Paris')).toEqual([])
    expect(wallClockInstants('2026-10-04T02:15', 'Australia/Lord_Howe')).toEqual([])
    expect(iso(wallClockInstants('2026-03-29T01:59:59.999', 'Europe/Paris'))).toEqual(['2026-03-29T00:59:59.999Z'])
    expect(iso(wallClockInstants('2026-03-29T03:00', 'Europe/Paris'))).toEqual(['2026-03-29T01:00:00.000Z'])
    expect(iso(wallClockInstants('2026-10-04T02:30', 'Australia/Lord_Howe'))).toEqual(['2026-10-03T15:30:00.000Z'])
  })
  it('reads only a whole local date and time, seconds and milliseconds optional (".1" is 100 ms)', () => {
    expect(iso(wallClockInstants('2026-12-05T12:00:00', 'UTC'))).toEqual(['2026-12-05T12:00:00.000Z'])
    expect(iso(wallClockInstants('2026-12-05T12:00:00.1', 'UTC'))).toEqual(['2026-12-05T12:00:00.100Z'])
    for (const bad of ['x2026-12-05T12:00', '2026-12-05T12:00x', '2026-12-05 12:00']) {
      expect(() => wallClockInstants(bad, 'UTC'), bad).toThrow(`not a local date and time: ${bad}`)
    }
  })
  it('is one on any other day, to the millisecond', () => {
    expect(iso(wallClockInstants('2026-12-05T12:00:00.123', 'Europe/Paris'))).toEqual(['2026-12-05T11:00:00.123Z'])
    expect(onDate('2026-12-05', 45_296_789)).toBe('2026-12-05T12:34:56.789')
  })
})

describe('a reading\'s time of day placed by its run\'s start', () => {
  it('in the repeated hour, is the occurrence nearest the start (the second, for a run started in it)', () => {
    // A run started at 01:24 MST (08:24Z); its reading at 01:25:00 is 08:25Z, not 07:25Z (an hour before it started).
    const ofDay = HOUR + 25 * 60_000
    expect(iso([nearestTimeOfDay(ofDay, Date.parse('2026-11-01T08:24:00Z'), 'America/Denver')!])).toEqual(['2026-11-01T08:25:00.000Z'])
    // Started at 01:24 MDT (07:24Z): the first.
    expect(iso([nearestTimeOfDay(ofDay, Date.parse('2026-11-01T07:24:00Z'), 'America/Denver')!])).toEqual(['2026-11-01T07:25:00.000Z'])
  })
  it('after the hour skipped, is an hour after local midnight + the time of day', () => {
    // 03:21:08.9 CEST is 01:21:08.9Z; local midnight (CET) + 3 h 21 min 8.9 s would be 02:21:08.9Z.
    const ofDay = 3 * HOUR + 21 * 60_000 + 8_900
    expect(iso([nearestTimeOfDay(ofDay, Date.parse('2026-03-29T01:20:00Z'), 'Europe/Paris')!])).toEqual(['2026-03-29T01:21:08.900Z'])
  })
  it('before midnight, for a start typed just after it, is on the day before; at 12 h either way, the earlier', () => {
    // Start typed 00:00:10 in Paris (23:00:10Z on the 5th); the first trap read 23:59:58 the day before (22:59:58Z).
    expect(iso([nearestTimeOfDay(24 * HOUR - 2_000, Date.parse('2026-12-05T23:00:10Z'), 'Europe/Paris')!])).toEqual(['2026-12-05T22:59:58.000Z'])
    // Midnight read against a start at noon UTC: yesterday's and today's midnights are both 12 h away; the earlier.
    expect(iso([nearestTimeOfDay(0, Date.parse('2026-12-05T12:00:00Z'), 'UTC')!])).toEqual(['2026-12-05T00:00:00.000Z'])
  })
  it('over midnight, is on the next day; for a start typed a little late, a few seconds before it', () => {
    // Started 23:59:30 in Paris (22:59:30Z), reading 00:00:20: the next day, 23:00:20Z.
    expect(iso([nearestTimeOfDay(20_000, Date.parse('2026-12-05T22:59:30Z'), 'Europe/Paris')!])).toEqual(['2026-12-05T23:00:20.000Z'])
    // Start typed as 10:00:30, the first trap read at 10:00:20: ten seconds before, the same day.
    expect(iso([nearestTimeOfDay(10 * HOUR + 20_000, Date.parse('2026-12-05T09:00:30Z'), 'Europe/Paris')!])).toEqual(['2026-12-05T09:00:20.000Z'])
  })
})

describe('a device\'s passings on a day the clocks go back', () => {
  const traps = [{ id: 1, courseId: 1, label: 'K-in' }, { id: 2, courseId: 1, label: 'K-out' }]
  const channels = [{ channel: '1', trapId: 1 }, { channel: '2', trapId: 2 }]
  const run = (id: number, at: string): CandidateRun => ({ id, courseId: 1, startedAtMs: Date.parse(at), closed: null, taken: [] })
  const assign = (runs: CandidateRun[], times: [string, string][], firstDay: string, timeZone: string) => assignPassings({
    passings: times.map(([channel, time], i) => ({ line: i + 2, channel, time })),
    channels, traps, runs, ticksPerSecond: 1000, timeZone, firstDay,
  })
  it('gives the first 01:12 to the run of the first hour and the second 01:12 to the run of the repeated one', () => {
    // Run 1 left at 01:10 MDT (07:10Z), run 2 at 01:10 MST (08:10Z); the device shows the same times for both.
    const r = assign([run(1, '2026-11-01T07:10:00Z'), run(2, '2026-11-01T08:10:00Z')],
      [['1', '01:12:00.000'], ['2', '01:12:09.000'], ['1', '01:12:00.000'], ['2', '01:12:09.000']], '2026-11-01', 'America/Denver')
    expect(r.assigned.map(a => [a.line, a.runId, new Date(a.atMs).toISOString()])).toEqual([
      [2, 1, '2026-11-01T07:12:00.000Z'], [3, 1, '2026-11-01T07:12:09.000Z'],
      [4, 2, '2026-11-01T08:12:00.000Z'], [5, 2, '2026-11-01T08:12:09.000Z'],
    ])
  })
  it('gives two passings at the same instant of the first hour both to its run, not the second to the repeated hour', () => {
    const r = assign([run(1, '2026-11-01T07:10:00Z'), run(2, '2026-11-01T08:10:00Z')],
      [['1', '01:12:00.000'], ['2', '01:12:00.000']], '2026-11-01', 'America/Denver')
    expect(r.assigned.map(a => [a.runId, new Date(a.atMs).toISOString()])).toEqual([[1, '2026-11-01T07:12:00.000Z'], [1, '2026-11-01T07:12:00.000Z']])
  })
  it('takes the first 01:30 for a run that started 30 min before it, to the millisecond, before a later run', () => {
    // Run 1 left at 01:00 MDT (07:00Z): the first 01:30 (07:30Z) is exactly 30 min on, still its; run 2 (08:10Z) does
    // not take it from the second 01:30 (08:30Z).
    const r = assign([run(1, '2026-11-01T07:00:00Z'), run(2, '2026-11-01T08:10:00Z')], [['1', '01:30:00.000']], '2026-11-01', 'America/Denver')
    expect(r.assigned.map(a => [a.runId, new Date(a.atMs).toISOString()])).toEqual([[1, '2026-11-01T07:30:00.000Z']])
  })
  it('gives a file that begins in the repeated hour to the run that can take it', () => {
    const r = assign([run(2, '2026-11-01T08:10:00Z')], [['1', '01:12:00.000']], '2026-11-01', 'America/Denver')
    expect(r.assigned.map(a => [a.runId, new Date(a.atMs).toISOString()])).toEqual([[2, '2026-11-01T08:12:00.000Z']])
  })
  it('lists a time in the hour skipped, never guessing it', () => {
    const r = assign([run(1, '2026-03-29T00:50:00Z')], [['1', '02:30:00.000']], '2026-03-29', 'Europe/Paris')
    expect(r.assigned).toEqual([])
    expect(r.unmatched).toEqual([{ line: 2, channel: '1', time: '02:30:00.000', reason: '02:30:00.000 did not exist on 2026-03-29 in Europe/Paris: the clocks skipped that hour' }])
  })
})
