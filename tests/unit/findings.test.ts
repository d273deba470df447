import { describe, expect, it } from 'vitest'
import { blocks, mayBeSetAside, withSetAsides, type Finding } from '#shared/rules/findings'

// Which failing findings an official may set aside in writing (common practice: judgement about how the runs were
// made or measured, never the arithmetic of the record nor the machine's class), and which stop the result.
const f = (code: string, severity: Finding['severity'] = 'fail'): Finding => ({ code, severity, message: code })
const aside = (id: number, code: string, runId: number | null) => ({ id, code, runId, by: 'Official A', at: '2026-12-05T10:00:00Z', reason: 'written reason' })

describe('setting findings aside', () => {
  it.each([
    ['timing.cross-check', 'fail', true],
    ['wind.tail-over-limit', 'fail', true],
    ['record.short', 'fail', false],
    ['qualifier.short', 'fail', false],
    ['class.mass-over', 'fail', false],
    ['timing.cross-check', 'warn', false],
    ['timing.cross-check', 'info', false],
    // A code that only contains a protected word elsewhere is still a judgement about the runs.
    ['timing.record.gap', 'fail', true],
  ] as const)('%s (%s): may be set aside %s', (code, severity, may) => {
    expect(mayBeSetAside(f(code, severity))).toBe(may)
  })

  it('a failing finding blocks until it is set aside; a warning never does', () => {
    expect(blocks(f('timing.cross-check'))).toBe(true)
    expect(blocks({ ...f('timing.cross-check'), setAside: { id: 1, by: 'A', at: 'x', reason: 'r' } })).toBe(false)
    expect(blocks(f('timing.cross-check', 'warn'))).toBe(false)
    expect(blocks(f('timing.cross-check', 'info'))).toBe(false)
  })

  it('applies a set-aside of the same code on the same run (or of the attempt, run null) only', () => {
    const findings = [f('timing.cross-check'), f('record.short'), f('wind.tail-over-limit', 'warn')]
    const out = withSetAsides(findings, 7, [aside(1, 'timing.cross-check', 8), aside(2, 'timing.cross-check', 7),
      aside(3, 'record.short', 7), aside(4, 'wind.tail-over-limit', 7)])
    expect(out[0]!.setAside).toEqual({ id: 2, by: 'Official A', at: '2026-12-05T10:00:00Z', reason: 'written reason' })
    // The record's arithmetic and a warning are never set aside, whatever is recorded.
    expect(out[1]!.setAside).toBeUndefined()
    expect(out[2]!.setAside).toBeUndefined()
    expect(out.map(blocks)).toEqual([false, true, false])
    // Of the attempt (run null): only a set-aside recorded for the attempt applies.
    expect(withSetAsides([f('timing.cross-check')], null, [aside(5, 'timing.cross-check', 7)])[0]!.setAside).toBeUndefined()
    expect(withSetAsides([f('timing.cross-check')], null, [aside(6, 'timing.cross-check', null)])[0]!.setAside?.id).toBe(6)
    // Another code on the same run does not apply.
    expect(withSetAsides([f('timing.cross-check')], 7, [aside(7, 'course.gradient-over-limit', 7)])[0]!.setAside).toBeUndefined()
  })
})
