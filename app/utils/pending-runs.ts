type SheetAttempt = RunSheet['attempts'][number]
type SheetRun = SheetAttempt['runs'][number] & { attempt: SheetAttempt, pendingKey?: string }

/**
 * Runs started on this device and waiting to be sent, shaped as the sheet's runs so their cells can be
 * filled offline: a negative id (their place in the queue), no readings from the server yet, and the
 * entry's open attempt (or the entry alone, for a run that will open one).
 */
export function pendingRuns(items: QueuedWrite[], sheet: RunSheet | null | undefined): SheetRun[] {
  if (!sheet) return []
  return items.filter(i => i.kind === 'run' && i.run).map((i) => {
    const run = i.run!
    const entry = sheet.entries.find(e => e.id === run.entryId)
    const open = [...sheet.attempts].reverse().find(a => a.entry.id === run.entryId && !a.sheet.locked)
    const attempt = open ?? {
      id: 0,
      entry: { id: run.entryId, machineName: entry?.machineName ?? 'entry', distanceLabel: 'measured distance' },
      sheet: { locked: false, latest: null, history: [] },
      runs: [],
    }
    return {
      id: -i.seq!,
      pendingKey: i.key,
      direction: run.direction,
      startedAt: run.startedAt,
      status: i.state === 'conflict' ? 'aborted' : 'started',
      abortedReason: i.state === 'conflict' ? `not written: ${i.message}` : null,
      official: null,
      readings: [],
      findings: [],
      segments: [],
      crossChecks: [],
      weather: null,
      wind: null,
      counted: false,
      attempt,
    } as unknown as SheetRun
  })
}
