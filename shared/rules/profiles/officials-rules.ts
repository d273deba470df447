import { q, toNumber } from '../exact'
import { mphToKmh } from '../units'
import type { Sourced } from '../profile'
import type { OfficialFunction } from '../../constants'
import type { LicenceGrade, LicenceRule } from '../start-line'
import type { ProtestRule } from '../protests'

/** A bracket's ceiling in km/h, by the project's exact unit conversion (1 mph = 1.609344 km/h). */
const bracket = (mph: number): LicenceGrade => ({ label: `${mph} mph`, maxKmh: toNumber(mphToKmh(q(mph))) })

/** Club practice: licences graded by speed brackets, each earned by a run in it; values to confirm per club. */
export const clubLicence: Sourced<LicenceRule> = {
  value: {
    grades: [
      bracket(125), bracket(150), bracket(175), bracket(200), bracket(250), { label: 'unlimited', maxKmh: null },
    ],
    medical: false,
  },
  source: 'dry-lake club rulebooks grade licences by speed, 25 mph steps to 200 mph then 250 mph and unlimited, '
    + 'each step earned by an observed run in the next bracket (from memory; the club sets its own brackets)',
  certainty: 'from memory',
}

/** International practice: a licence of the issuing federation valid on the day, with a valid medical. */
export const internationalLicence: Sourced<LicenceRule> = {
  value: { grades: null, medical: true },
  source: 'an international licence of the federation, valid on the day, issued with a medical examination '
    + '(common practice, from memory; confirm in the licence regulations in force)',
  certainty: 'common practice',
}

export const briefingRequired: Sourced<boolean> = {
  value: true,
  source: 'riders attend the briefing of the clerk of the course before running (common practice)',
  certainty: 'common practice',
}

/** Protests within 30 min of publication, appeal notice within 1 h of the decision (sporting codes, from memory). */
export const internationalProtests: Sourced<ProtestRule> = {
  value: {
    lodge: { kind: 'minutes', minutes: 30 },
    fee: 'set by the national authority that issued the permit',
    appeal: { deadline: { kind: 'minutes', minutes: 60 }, to: 'the national court of appeal of the permit\'s issuer' },
  },
  source: 'international sporting and disciplinary codes: protests against a result within 30 min of its '
    + 'publication, notice of appeal within 1 h of the stewards\' decision (from memory; confirm in the code in force)',
  certainty: 'from memory',
}

export const clubProtests: Sourced<ProtestRule> = {
  value: {
    lodge: { kind: 'minutes', minutes: 60 },
    fee: 'set by the club',
    appeal: { deadline: { kind: 'clock', at: '12:00', daysAfter: 1 }, to: 'the club\'s board' },
  },
  source: 'protest within an hour of the time slip, appeal to the club\'s board by noon the next day '
    + '(common practice, not checked against a rulebook: a setting of the profile)',
  certainty: 'common practice',
}

/** A panel of stewards deciding by majority: two of the three sign (sporting codes, from memory). */
export const internationalStewards: Sourced<{ quorum: number }> = {
  value: { quorum: 2 },
  source: 'the stewards of a meeting form a panel, commonly of three, and decide by majority (international sporting '
    + 'codes, from memory; confirm in the code in force)',
  certainty: 'from memory',
}

/** A club meet's steward, one appointed by the club (a setting of the profile). */
export const clubStewards: Sourced<{ quorum: number }> = {
  value: { quorum: 1 },
  source: 'a club meet names one steward for its decisions (common practice, not checked against a rulebook: a '
    + 'setting of the profile)',
  certainty: 'common practice',
}

/** The sanctioning body's observer revokes a ratification made at the event (common practice, from memory). */
export const internationalRevocation: Sourced<OfficialFunction> = {
  value: 'observer',
  source: 'a ratification is revoked only by the sanctioning body, through its appointed observer, with reasons '
    + '(common practice, from memory; confirm in the code in force)',
  certainty: 'from memory',
}

/** At a club meet, the steward revokes (a setting of the profile). */
export const clubRevocation: Sourced<OfficialFunction> = {
  value: 'steward',
  source: 'a club meet\'s steward revokes a ratification, with reasons (common practice, not checked against a '
    + 'rulebook: a setting of the profile)',
  certainty: 'common practice',
}
