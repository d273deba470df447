import type { Certainty } from './profile'

export type Severity = 'fail' | 'warn' | 'info'

/** A problem or note about a run or attempt, with the rule value and its source where one applies. */
export interface Finding {
  code: string
  severity: Severity
  message: string
  rule?: { name: string, value: string, source: string, certainty: Certainty }
}
