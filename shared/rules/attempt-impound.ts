import type { Finding } from './findings'
import type { RuleProfile } from './profile'
import { localDateTime } from './zoned'

/**
 * The impound check-in after a qualifying run, against the profile's limit from the run's time slip
 * (the instant it left the measured distance). `checkInMs` null: none recorded yet; undefined: not
 * tracked here (the public calculator), so nothing is said.
 */
export function impoundFindings(
  profile: RuleProfile,
  qualifierFinishMs: number,
  checkInMs: number | null | undefined,
  hasRecordRun: boolean,
  timeZone: string,
): { deadlineMs: number | null, findings: Finding[] } {
  const minutes = profile.impoundMinutes.value
  if (!profile.qualifying?.value || minutes === null || checkInMs === undefined) {
    return { deadlineMs: null, findings: [] }
  }
  const deadlineMs = qualifierFinishMs + minutes * 60_000
  const rule = {
    name: 'Impound after a qualifying run',
    value: `within ${minutes} min of the time slip`,
    source: profile.impoundMinutes.source,
    certainty: profile.impoundMinutes.certainty,
  }
  const at = (ms: number) => `${localDateTime(ms, timeZone)} (${timeZone})`
  if (checkInMs === null) {
    return {
      deadlineMs,
      findings: [hasRecordRun
        ? { code: 'impound.missing', severity: 'fail', rule,
            message: 'No impound check-in is recorded after the qualifying run.' }
        : { code: 'impound.awaiting', severity: 'info', rule,
            message: `The machine goes into impound by ${at(deadlineMs)}.` }],
    }
  }
  if (checkInMs < qualifierFinishMs) {
    return { deadlineMs, findings: [{ code: 'impound.before-run', severity: 'fail', rule,
      message: `The impound check-in at ${at(checkInMs)} is before the qualifying run finished.` }] }
  }
  if (checkInMs > deadlineMs) {
    const late = Math.ceil((checkInMs - deadlineMs) / 60_000)
    const message = `The machine went into impound at ${at(checkInMs)}, ${late} min after the limit of `
      + `${at(deadlineMs)}.`
    return { deadlineMs, findings: [{ code: 'impound.late', severity: 'fail', rule, message }] }
  }
  return { deadlineMs, findings: [] }
}
