import { motorcycleClasses } from '../classes'
import type { RuleProfile } from '../profile'
import {
  briefingRequired,
  internationalLicence,
  internationalProtests,
  internationalStewards,
  internationalRevocation,
} from './officials-rules'

const FIM_PAGE = 'FIM world records page'

export const intlMotorcycle: RuleProfile = {
  id: 'intl-motorcycle',
  version: 1,
  name: 'International motorcycle',
  summary: 'Two runs in opposite directions within two hours; result from the mean of the two times.',
  runs: { value: { count: 2, directions: 'opposite' }, source: FIM_PAGE, certainty: 'seen' },
  window: {
    value: { kind: 'elapsed', minutes: 120, from: 'start-first', to: 'finish-second' },
    source: `${FIM_PAGE}: the whole attempt, start of the first run to finish of the second, within 2 h`,
    certainty: 'seen',
  },
  impoundMinutes: { value: null, source: 'no rule found', certainty: 'not known' },
  averaging: {
    value: 'mean-of-times',
    source: 'distance ÷ mean of the two times (harmonic mean of the speeds), checked against published records',
    certainty: 'seen',
  },
  figures: {
    value: { decimals: 3, rounding: 'truncate' },
    source: 'speeds to 3 decimals, truncated, in km/h and mph: published records only fit truncation',
    certainty: 'seen',
  },
  margin: {
    value: { percent: 0, inclusive: false },
    source: 'exceed the standing record; a margin is not known',
    certainty: 'from memory',
  },
  gradientMaxPercent: { value: 1, source: `${FIM_PAGE}: straight, gradient at most 1 %`, certainty: 'seen' },
  distances: {
    value: [
      { label: 'Flying kilometre', metres: '1000', start: 'flying' },
      { label: 'Flying mile', metres: '1609.344', start: 'flying' },
      { label: 'Standing quarter mile', metres: '402.336', start: 'standing' },
      { label: 'Standing kilometre', metres: '1000', start: 'standing' },
      { label: 'Standing mile', metres: '1609.344', start: 'standing' },
    ],
    source: `${FIM_PAGE}: flying start 1 km and 1 mile; standing start 1/4 mile, 1 km and 1 mile`,
    certainty: 'seen',
  },
  tailWindLimitMs: {
    value: null,
    source: 'motor-sport record rules rely on the two-way average; no published wind limit found',
    certainty: 'not known',
  },
  bestPerDayOnly: {
    value: true,
    source: 'FIM rulebook extract: only the best result per class each day goes forward',
    certainty: 'seen',
  },
  massClasses: {
    value: null,
    source: 'class limits by mass to be set from the rulebook in force',
    certainty: 'not known',
  },
  witnessStatements: { value: 2, source: 'default of the ratification file', certainty: 'common practice' },
  qualifying: { value: null, source: 'two runs in opposite directions, no qualifying run', certainty: 'seen' },
  appointments: {
    value: ['clerk-of-course', 'chief-timekeeper', 'chief-scrutineer', 'observer'],
    source: 'a clerk of the course, chief timekeeper and chief scrutineer at the event, and an observer of '
      + 'the federation for a world record (common practice; confirm in the rulebook in force)',
    certainty: 'common practice',
  },
  licence: internationalLicence,
  briefing: briefingRequired,
  protests: internationalProtests,
  stewards: internationalStewards,
  revokedBy: internationalRevocation,
  postRunCheck: {
    value: false,
    source: 'not asked by default; the organiser asks for it where the rulebook does (common practice: mass or '
      + 'capacity re-measured after a record)',
    certainty: 'common practice',
  },
  classes: {
    value: motorcycleClasses(),
    source: 'FIM extract: electric classes by streamlining division (seen); combustion capacity steps from memory, '
      + 'to confirm against the rulebook in force',
    certainty: 'from memory',
  },
}
