import { describe, expect, it } from 'vitest'
import { assignPassings, deviceDate, readDeviceFile, type CandidateRun } from '#shared/rules/device-file'

// A timing device's list of passings (delimited text as RFC 4180 describes it) at its edges: the layout's columns,
// lines that cannot be read, the 30 min a run is open for its passings (common practice: a run is over in minutes),
// the clock going back past midnight (more than 12 h earlier), and the device's own order. Invented passings.
const layout = { delimiter: 'auto' as const, header: true, columns: { channel: 'Ch', time: 'Time' } }

describe('reading the file by its layout', () => {
  it('takes off a byte-order mark and spaces, and trims cells and names', () => {
    const r = readDeviceFile('\uFEFF  Ch ; Time \n 1 ; 10:00:00.000 \n\n2;10:00:09.000\n  ', layout)
    expect(r).toEqual({ problems: [], passings: [{ line: 2, channel: '1', time: '10:00:00.000' }, { line: 3, channel: '2', time: '10:00:09.000' }] })
  })
  it('reads the separator it is told, not another', () => {
    const r = readDeviceFile('Ch|Time\n1|10:00:00.000', { ...layout, delimiter: '|' })
    expect(r.passings).toEqual([{ line: 2, channel: '1', time: '10:00:00.000' }])
    expect(readDeviceFile('Ch;Time\n1;10:00:00.000', { ...layout, delimiter: ',' }).problems[0]!.message)
      .toBe('channel: no column "Ch" in the first line (Ch;Time)')
  })
  it('names every column of the layout that is not there; an optional column left out is no problem', () => {
    const r = readDeviceFile('Ch,Time\n1,10:00:00.000', { ...layout, columns: { channel: 'Ch', time: 'Time', date: 'Day', sequence: 'Seq' } })
    expect(r).toEqual({ passings: [], problems: [
      { line: 1, message: 'date: no column "Day" in the first line (Ch, Time)' },
      { line: 1, message: 'sequence: no column "Seq" in the first line (Ch, Time)' },
    ] })
  })
  it('numbers columns from 1 without a header, and refuses 0 or a word as a column number', () => {
    const numbered = { delimiter: ',' as const, header: false, columns: { channel: '2', time: '1', sequence: '3' } }
    expect(readDeviceFile('10:00:00.000,1,7', numbered).passings).toEqual([{ line: 1, channel: '1', time: '10:00:00.000', sequence: 7 }])
    expect(readDeviceFile('10:00:00.000,1', { ...numbered, columns: { channel: '0', time: 'one' } }).problems).toEqual([
      { line: 1, message: 'channel: column 0 is not a column number (1, 2, …)' },
      { line: 1, message: 'time: column one is not a column number (1, 2, …)' },
    ])
    expect(readDeviceFile('10:00:00.000,1', { ...numbered, columns: { channel: '1.5', time: '1' } }).problems[0]!.message)
      .toBe('channel: column 1.5 is not a column number (1, 2, …)')
  })
  it('lists a line with no channel or no time, and a sequence number that is not whole', () => {
    const withSeq = { ...layout, columns: { channel: 'Ch', time: 'Time', sequence: 'Seq', date: 'Day' } }
    const r = readDeviceFile('Ch,Time,Seq,Day\n,10:00:00.000,1,2026-12-05\n1, ,2,2026-12-05\n1,10:00:01.000,2.5,2026-12-05\n1,10:00:02.000,3,05.12.2026', withSeq)
    expect(r.problems).toEqual([
      { line: 2, message: 'no channel or no time on this line' },
      { line: 3, message: 'no channel or no time on this line' },
      { line: 4, message: 'the sequence number "2.5" is not a whole number' },
    ])
    expect(r.passings).toEqual([{ line: 5, channel: '1', time: '10:00:02.000', sequence: 3, date: '05.12.2026' }])
  })
  it('reads a date as ISO 8601 or day.month.year, with dots or slashes', () => {
    expect(deviceDate('2026-12-05')).toBe('2026-12-05')
    expect(deviceDate('05.12.2026')).toBe('2026-12-05')
    expect(deviceDate('05/12/2026')).toBe('2026-12-05')
    for (const bad of ['5.12.2026', '2026/12/05', '12-05-2026', 'x2026-12-05', '2026-12-05x', '05.12.2026x']) expect(deviceDate(bad), bad).toBeNull()
  })
})

describe('giving passings to runs, at the edges', () => {
  const traps = [{ id: 1, courseId: 1, label: 'K-in' }, { id: 2, courseId: 1, label: 'K-out' }, { id: 3, courseId: 2, label: 'S-in' }]
  const channels = [{ channel: '1', trapId: 1 }, { channel: '2', trapId: 2 }, { channel: '3', trapId: 3 }]
  const run = (id: number, iso: string, courseId = 1, extra: Partial<CandidateRun> = {}): CandidateRun =>
    ({ id, courseId, startedAtMs: Date.parse(iso), closed: null, taken: [], ...extra })
  const assign = (runs: CandidateRun[], passings: { line: number, channel: string, time: string, sequence?: number, date?: string }[]) =>
    assignPassings({ passings, channels, traps, runs, ticksPerSecond: 1000, timeZone: 'UTC', firstDay: '2026-12-05' })

  it('takes a passing from the instant its run started to 30 min after, and not a millisecond more', () => {
    const runs = [run(1, '2026-12-05T10:00:00Z')]
    expect(assign(runs, [{ line: 1, channel: '1', time: '10:00:00.000' }]).assigned.map(a => a.runId)).toEqual([1])
    expect(assign(runs, [{ line: 1, channel: '1', time: '09:59:59.999' }]).unmatched)
      .toEqual([{ line: 1, channel: '1', time: '09:59:59.999', reason: 'before any run on K-in\'s course started' }])
    expect(assign(runs, [{ line: 1, channel: '2', time: '10:30:00.000' }]).assigned.map(a => a.trapLabel)).toEqual(['K-out'])
    expect(assign(runs, [{ line: 1, channel: '2', time: '10:30:00.001' }]).unmatched[0]!.reason)
      .toBe('more than 30 min after run 1 started, and no later run had started')
  })
  it('gives a passing to the run on its trap\'s course that started last, whatever order the runs come in', () => {
    const runs = [run(3, '2026-12-05T10:20:00Z', 2), run(2, '2026-12-05T10:10:00Z'), run(1, '2026-12-05T10:00:00Z')]
    const r = assign(runs, [{ line: 1, channel: '1', time: '10:25:00.000' }, { line: 2, channel: '3', time: '10:25:00.000' }, { line: 3, channel: '1', time: '10:05:00.000' }])
    expect(r.assigned.map(a => [a.line, a.runId])).toEqual([[1, 2], [2, 3], [3, 1]])
    expect(r.assigned[0]!.atMs).toBe(Date.parse('2026-12-05T10:25:00Z'))
    expect(r.assigned[0]!.ticks).toBe(37_500_000n)
  })
  it('refuses a passing of a closed run, or of a trap that already has its time, saying why', () => {
    const runs = [run(1, '2026-12-05T10:00:00Z', 1, { closed: 'was aborted', taken: [2] })]
    expect(assign(runs, [{ line: 4, channel: '1', time: '10:01:00.000' }]).unmatched[0]!.reason).toBe('run 1 was aborted')
    const open = [run(1, '2026-12-05T10:00:00Z', 1, { taken: [2] })]
    expect(assign(open, [{ line: 4, channel: '2', time: '10:01:00.000' }]).unmatched[0]!.reason)
      .toBe('K-out on run 1 already has a time from this system; correct it on the run sheet')
  })
  it('refuses a time it cannot read, or finer than the system resolves, and a date it cannot read', () => {
    const runs = [run(1, '2026-12-05T10:00:00Z')]
    const r = assign(runs, [
      { line: 1, channel: '1', time: '25:00:00.000' },
      { line: 2, channel: '1', time: '10:00:00.0001' },
      { line: 3, channel: '1', time: '10:01:00.000', date: '2026.12.05' },
    ])
    expect(r.unmatched.map(u => u.reason)).toEqual([
      'the time cannot be read: time of day out of range: 25:00:00.000',
      'the time cannot be read: more decimals than the timing system resolves: 10:00:00.0001',
      'the date "2026.12.05" cannot be read (YYYY-MM-DD or DD.MM.YYYY)',
    ])
  })
  it('moves to the next day only when the clock goes back by more than 12 h', () => {
    const runs = [run(1, '2026-12-05T23:50:00Z'), run(2, '2026-12-05T11:50:00Z'), run(3, '2026-12-06T00:00:00Z')]
    // 23:59 then 00:05: 23 h 54 min back, so the next day (run 3 started at 00:00 on the 6th).
    const rolled = assign(runs, [{ line: 1, channel: '1', time: '23:59:00.000' }, { line: 2, channel: '2', time: '00:05:00.000' }])
    expect(rolled.assigned.map(a => [a.line, a.runId, new Date(a.atMs).toISOString()]))
      .toEqual([[1, 1, '2026-12-05T23:59:00.000Z'], [2, 3, '2026-12-06T00:05:00.000Z']])
    // 23:59 then 11:59: exactly 12 h back is the same day (run 2, started 11:50 on the 5th).
    const same = assign(runs, [{ line: 1, channel: '1', time: '23:59:00.000' }, { line: 2, channel: '2', time: '11:59:00.000' }])
    expect(same.assigned.map(a => [a.line, a.runId])).toEqual([[1, 1], [2, 2]])
  })
  it('follows the sequence numbers only when every line has one', () => {
    const runs = [run(1, '2026-12-05T10:00:00Z')]
    // Without sequence numbers on every line, the lines' order decides the day: 23:59 written first rolls 00:05 over.
    const partial = assign([run(1, '2026-12-05T00:00:00Z'), run(2, '2026-12-05T23:58:00Z')],
      [{ line: 1, channel: '1', time: '23:59:00.000', sequence: 2 }, { line: 2, channel: '2', time: '00:05:00.000' }])
    expect(partial.assigned.map(a => [a.line, a.runId, new Date(a.atMs).toISOString()]))
      .toEqual([[1, 2, '2026-12-05T23:59:00.000Z'], [2, 2, '2026-12-06T00:05:00.000Z']])
    const ordered = assign(runs, [{ line: 1, channel: '2', time: '10:00:09.000', sequence: 2 }, { line: 2, channel: '1', time: '10:00:00.000', sequence: 1 }])
    expect(ordered.assigned.map(a => a.line)).toEqual([2, 1])
  })
  it('lists both passings of a trap met twice on one run, naming their lines', () => {
    const r = assign([run(1, '2026-12-05T10:00:00Z')], [{ line: 7, channel: '1', time: '10:01:00.000' }, { line: 9, channel: '1', time: '10:02:00.000' }])
    expect(r.assigned).toEqual([])
    expect(r.unmatched.map(u => [u.line, u.reason])).toEqual([
      [7, 'K-in twice on run 1 (lines 7 and 9): which one counts is for the timekeeper'],
      [9, 'K-in twice on run 1 (lines 7 and 9): which one counts is for the timekeeper'],
    ])
  })
})
