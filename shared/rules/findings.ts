import type { Certainty } from './profile'

export type Severity = 'fail' | 'warn' | 'info'

/** An official's signed decision that a failing finding does not stop the result, with the reason. */
export interface SetAside {
  id: number
  by: string
  at: string
  reason: string
}

/** A problem or note about a run or attempt, with the rule value and its source where one applies. */
export interface Finding {
  code: string
  severity: Severity
  message: string
  rule?: { name: string, value: string, source: string, certainty: Certainty }
  /** Present when an official has set the failing finding aside in writing. */
  setAside?: SetAside
}

/**
 * Whether an official may set a finding aside: any failing finding about how the runs were made or
 * measured; never whether the result beats the record, which is arithmetic, not judgement, nor whether
 * the machine fits its class, which the scrutineer's measurements decide.
 */
export const mayBeSetAside = (f: Pick<Finding, 'code' | 'severity'>) =>
  f.severity === 'fail' && !f.code.startsWith('record.') && !f.code.startsWith('qualifier.')
  && !f.code.startsWith('class.')

/** A finding that stops the result: failing and not set aside. */
export const blocks = (f: Finding) => f.severity === 'fail' && !f.setAside

/** The findings with the set-asides that apply to them (same code, same run or both of the attempt). */
export function withSetAsides<F extends Finding>(
  findings: F[],
  runId: number | null,
  setAsides: (SetAside & { code: string, runId: number | null })[],
): F[] {
  return findings.map((f) => {
    if (!mayBeSetAside(f)) return f
    const s = setAsides.find(x => x.code === f.code && x.runId === runId)
    return s ? { ...f, setAside: { id: s.id, by: s.by, at: s.at, reason: s.reason } } : f
  })
}
