import type { RuleProfile } from '../profile'
import {
  briefingRequired,
  internationalLicence,
  internationalProtests,
  internationalStewards,
  internationalRevocation,
} from './officials-rules'
import type { RecordClass } from '../classes'

const electricCar = (words: string, massKg: { over: number, upTo: number | null }): RecordClass =>
  ({ label: `Electric automobile, ${words}`, propulsion: 'electric', massKg, certainty: 'from memory' })

const APPENDIX_D = 'FIA International Sporting Code, Appendix D'

export const intlAutomobile: RuleProfile = {
  id: 'intl-automobile',
  version: 1,
  name: 'International automobile',
  summary: 'Two runs in opposite directions within 60 minutes; at least 1 % over the standing record.',
  runs: {
    value: { count: 2, directions: 'opposite' },
    source: `${APPENDIX_D}; seen in press reports of 1997 homologations`,
    certainty: 'seen',
  },
  window: {
    value: { kind: 'elapsed', minutes: 60, from: 'start-first', to: 'finish-second' },
    source: `${APPENDIX_D} as reported: 60 min between the runs (runs 61 min apart were refused); the anchors are `
      + `not settled, default start of the first run to finish of the second`,
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
    value: { percent: 1, inclusive: true },
    source: '1983 case reported by a motor-sport magazine',
    certainty: 'seen',
  },
  gradientMaxPercent: { value: null, source: 'straight course; no gradient limit known', certainty: 'from memory' },
  distances: {
    value: [
      { label: 'Flying kilometre', metres: '1000', start: 'flying' },
      { label: 'Flying mile', metres: '1609.344', start: 'flying' },
    ],
    source: 'flying km and flying mile',
    certainty: 'seen',
  },
  tailWindLimitMs: {
    value: null,
    source: 'motor-sport record rules rely on the two-way average; no published wind limit found',
    certainty: 'not known',
  },
  bestPerDayOnly: { value: null, source: 'not known', certainty: 'not known' },
  massClasses: {
    value: null,
    source: 'class limits by mass to be set from the rulebook in force',
    certainty: 'not known',
  },
  witnessStatements: { value: 2, source: 'default of the ratification file', certainty: 'common practice' },
  qualifying: { value: null, source: 'two runs in opposite directions, no qualifying run', certainty: 'seen' },
  appointments: {
    value: ['clerk-of-course', 'chief-timekeeper', 'chief-scrutineer', 'observer'],
    source: 'a clerk of the course, chief timekeeper and chief scrutineer, and an observer of the federation '
      + '(common practice; confirm in the rulebook in force)',
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
    value: [
      electricCar('up to 500 kg', { over: 0, upTo: 500 }),
      electricCar('over 500 kg up to 1000 kg', { over: 500, upTo: 1000 }),
      electricCar('over 1000 kg', { over: 1000, upTo: null }),
      { label: 'Combustion automobile, open', propulsion: 'combustion', certainty: 'from memory' },
    ],
    source: 'from memory of the international sporting code\'s electric group, classes by mass: confirm against the '
      + 'rulebook in force; the organiser adapts the list',
    certainty: 'from memory',
  },
}
