import { describe, expect, it } from 'vitest'
import { assignPassings, deviceDate, readDeviceFile, type CandidateRun } from '#shared/rules/device-file'

// Delimited text as RFC 4180 describes it (a header line, then records; the semicolon and tab layouts are
// the same with another separator, common practice of timing devices set to a European locale). Times of
// day at 1/10 000 s (the run sheet's resolution). The runs and traps are invented for the test.
const traps = [
  { id: 11, courseId: 1, label: 'K-in' },
  { id: 12, courseId: 1, label: 'K-out' },
]
const channels = [{ channel: '1', trapId: 11 }, { channel: '2', trapId: 12 }]
const UTC = 'UTC'
const at = (iso: string) => Date.parse(iso)
const run = (id: number, startIso: string, extra: Partial<CandidateRun> = {}): CandidateRun =>
  ({ id, courseId: 1, startedAtMs: at(startIso), closed: null, taken: [], ...extra })

describe('reading a device file', () => {
  it('reads a header layout with any common separator', () => {
    for (const sep of [',', ';', '\t']) {
      const text = ['Seq;Ch;Time of day'.replaceAll(';', sep), `1${sep}1${sep}10:01:00.0000`, `2${sep}2${sep}10:01:09.0000`].join('\n')
      const r = readDeviceFile(text, { delimiter: 'auto', header: true, columns: { channel: 'Ch', time: 'Time of day', sequence: 'Seq' } })
      expect(r.problems).toEqual([])
      expect(r.passings).toEqual([
        { line: 2, channel: '1', time: '10:01:00.0000', sequence: 1 },
        { line: 3, channel: '2', time: '10:01:09.0000', sequence: 2 },
      ])
    }
  })

  it('reads numbered columns without a header, and names a column that is not there', () => {
    const r = readDeviceFile('C1,10:01:00.0000\nC2,10:01:09.0000', { delimiter: ',', header: false, columns: { channel: '1', time: '2' } })
    expect(r.passings.map(p => [p.line, p.channel])).toEqual([[1, 'C1'], [2, 'C2']])
    const bad = readDeviceFile('Ch,Time\n1,10:00:00', { delimiter: ',', header: true, columns: { channel: 'Channel', time: 'Time' } })
    expect(bad.problems[0]!.message).toBe('channel: no column "Channel" in the first line (Ch, Time)')
  })

  it('reads ISO and day.month.year dates', () => {
    expect(deviceDate('2026-08-20')).toBe('2026-08-20')
    expect(deviceDate('20.08.2026')).toBe('2026-08-20')
    expect(deviceDate('20/08/2026')).toBe('2026-08-20')
    expect(deviceDate('Aug 20')).toBeNull()
  })
})

describe('giving passings to runs', () => {
  const base = { channels, traps, ticksPerSecond: 10_000, timeZone: UTC, firstDay: '2026-08-20' }

  it('gives each run the passings between its start and the next run\'s, and lists an unknown channel', () => {
    const { assigned, unmatched } = assignPassings({
      ...base,
      runs: [run(1, '2026-08-20T10:00:00Z'), run(2, '2026-08-20T10:40:00Z')],
      passings: [
        { line: 2, channel: '1', time: '10:01:00.0000' },
        { line: 3, channel: '2', time: '10:01:09.0000' },
        { line: 4, channel: '7', time: '10:20:00.0000' },
        { line: 5, channel: '2', time: '10:41:00.0000' },
        { line: 6, channel: '1', time: '10:41:09.5000' },
      ],
    })
    expect(assigned.map(a => [a.line, a.runId, a.trapLabel])).toEqual([[2, 1, 'K-in'], [3, 1, 'K-out'], [5, 2, 'K-out'], [6, 2, 'K-in']])
    expect(unmatched).toEqual([{ line: 4, channel: '7', time: '10:20:00.0000', reason: 'channel 7 is not in the channel map' }])
    // 10:41:09.5 on 2026-08-20 UTC: the instant is the day's midnight plus the time of day.
    expect(new Date(assigned[3]!.atMs).toISOString()).toBe('2026-08-20T10:41:09.500Z')
  })

  it('rolls over midnight to the next day when the clock goes back', () => {
    const { assigned, unmatched } = assignPassings({
      ...base,
      runs: [run(1, '2026-08-20T23:58:00Z'), run(2, '2026-08-21T00:20:00Z')],
      passings: [
        { line: 1, channel: '1', time: '23:59:55.0000' },
        { line: 2, channel: '2', time: '00:00:04.0000' },
        { line: 3, channel: '2', time: '00:21:00.0000' },
      ],
    })
    expect(unmatched).toEqual([])
    expect(assigned.map(a => [a.runId, new Date(a.atMs).toISOString()])).toEqual([
      [1, '2026-08-20T23:59:55.000Z'],
      [1, '2026-08-21T00:00:04.000Z'],
      [2, '2026-08-21T00:21:00.000Z'],
    ])
  })

  it('follows the sequence numbers over the order of the lines', () => {
    const { assigned } = assignPassings({
      ...base,
      runs: [run(1, '2026-08-20T23:58:00Z')],
      passings: [
        { line: 1, channel: '2', time: '00:00:04.0000', sequence: 2 },
        { line: 2, channel: '1', time: '23:59:55.0000', sequence: 1 },
      ],
    })
    expect(assigned.map(a => new Date(a.atMs).toISOString())).toEqual(['2026-08-20T23:59:55.000Z', '2026-08-21T00:00:04.000Z'])
  })

  it('lists a trap met twice on a run, and passings before any run, long after one, or on a closed run', () => {
    const { assigned, unmatched } = assignPassings({
      ...base,
      runs: [run(1, '2026-08-20T10:00:00Z'), run(2, '2026-08-20T12:00:00Z', { closed: 'belongs to a signed timing sheet' }), run(3, '2026-08-20T14:00:00Z', { taken: [11] })],
      passings: [
        { line: 1, channel: '1', time: '09:00:00.0000' },
        { line: 2, channel: '1', time: '10:01:00.0000' },
        { line: 3, channel: '1', time: '10:01:01.0000' },
        { line: 4, channel: '2', time: '10:01:09.0000' },
        { line: 5, channel: '2', time: '11:00:00.0000' },
        { line: 6, channel: '2', time: '12:01:00.0000' },
        { line: 7, channel: '1', time: '14:01:00.0000' },
      ],
    })
    expect(assigned.map(a => a.line)).toEqual([4])
    expect(unmatched.map(u => [u.line, u.reason])).toEqual([
      [1, 'before any run on K-in\'s course started'],
      [2, 'K-in twice on run 1 (lines 2 and 3): which one counts is for the timekeeper'],
      [3, 'K-in twice on run 1 (lines 2 and 3): which one counts is for the timekeeper'],
      [5, 'more than 30 min after run 1 started, and no later run had started'],
      [6, 'run 2 belongs to a signed timing sheet'],
      [7, 'K-in on run 3 already has a time from this system; correct it on the run sheet'],
    ])
  })

  it('takes a date column over the first day, and refuses a time finer than the system resolves', () => {
    const { assigned, unmatched } = assignPassings({
      ...base,
      ticksPerSecond: 1000,
      runs: [run(1, '2026-08-22T10:00:00Z')],
      passings: [
        { line: 1, channel: '1', time: '10:01:00.000', date: '22.08.2026' },
        { line: 2, channel: '2', time: '10:01:09.0001', date: '2026-08-22' },
      ],
    })
    expect(assigned.map(a => a.line)).toEqual([1])
    expect(unmatched[0]!.reason).toMatch(/^the time cannot be read/)
  })
})
