import { describe, expect, it } from 'vitest'
import { blocks, mayBeSetAside, SET_ASIDE_RULES, setAsideQuorum, setAsideRule, withSetAsides, type Finding, type SetAsideAuthority } from '#shared/rules/findings'

// Who may set a failing finding aside: the conditions of a record never (common practice: the runs, the course, the
// wind limit, the licence at the run, the class, the club's qualifier and impound, the record's arithmetic, a reading
// that cannot be right), a disagreement between the timing systems only by the appointed stewards together, a time
// one system lacks by the appointed chief timekeeper in writing.
const f = (code: string, severity: Finding['severity'] = 'fail'): Finding => ({ code, severity, message: code })
const aside = (id: number, code: string, runId: number | null) => ({ id, code, runId, by: 'Official A', at: '2026-12-05T10:00:00Z', reason: 'written reason' })

/** Every failing or warning code the rules engine and the live results give today, with who may set it aside. */
const CODES: [string, SetAsideAuthority][] = [
  ['pair.direction', 'never'], ['pair.overlap', 'never'], ['window.exceeded', 'never'],
  ['course.distance-off-survey', 'never'], ['course.gradient-over-limit', 'never'], ['wind.tail-over-limit', 'never'],
  ['rider.licence-expired', 'never'], ['rider.medical', 'never'], ['licence.expired', 'never'], ['licence.medical', 'never'], ['licence.grade', 'never'],
  ['class.outside', 'never'], ['impound.missing', 'never'], ['impound.late', 'never'], ['impound.before-run', 'never'],
  ['qualifier.not-over-record', 'never'], ['record.not-beaten', 'never'], ['record.margin-not-met', 'never'],
  ['record.minimum-not-reached', 'never'], ['return.unreachable', 'never'], ['reading.out-of-order', 'never'],
  ['reading.implausible-speed', 'never'], ['reading.implausible-acceleration', 'never'], ['protest.result-void', 'never'], ['protest.run-void', 'never'],
  ['timing.cross-check', 'stewards'], ['timing.single-system', 'chief-timekeeper'],
]

describe('setting findings aside', () => {
  it.each(CODES)('%s: %s', (code, authority) => {
    const rule = setAsideRule(code)
    expect(rule.authority).toBe(authority)
    // Listed by the rules, not reached by the default for a code nobody listed.
    expect(rule.codes.some(c => c === code || (c.endsWith('.') && code.startsWith(c)))).toBe(true)
    expect(SET_ASIDE_RULES).toContain(rule)
    expect(rule.why.length).toBeGreaterThan(20)
    expect(mayBeSetAside(f(code))).toBe(authority !== 'never')
  })

  it('the chief timekeeper writes alone why one system has no time; the stewards sign by their quorum', () => {
    // A gap in the timing evidence is the chief timekeeper's to account for (common practice); a disagreement
    // between the systems is the stewards' (two of three internationally, from memory).
    expect(setAsideQuorum('timing.single-system', 2)).toBe(1)
    expect(setAsideQuorum('timing.cross-check', 2)).toBe(2)
    expect(setAsideQuorum('timing.cross-check', 1)).toBe(1)
  })

  it.each([
    // Only a failing finding is set aside: a warning or a note never blocks.
    ['timing.cross-check', 'warn', false],
    ['timing.cross-check', 'info', false],
    // A code that only contains a family's word elsewhere is not in that family, and one nobody listed is never set aside.
    ['timing.record.gap', 'fail', false],
    ['timing.cross-checked', 'fail', false],
    ['novel.finding', 'fail', false],
  ] as const)('%s (%s): may be set aside %s', (code, severity, may) => {
    expect(mayBeSetAside(f(code, severity))).toBe(may)
  })

  it('a code nobody listed is refused with a reason of its own', () => {
    expect(setAsideRule('novel.finding')).toEqual({
      codes: ['novel.finding'],
      authority: 'never',
      why: 'no rule lets this finding be set aside',
      source: 'a finding no rule lists is a condition of the record until one does (common practice)',
      certainty: 'common practice',
    })
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
