import { motorcycleClasses } from '../classes'
import type { RuleProfile } from '../profile'
import { briefingRequired, clubLicence, clubProtests, clubStewards, clubRevocation } from './officials-rules'

const CLUB_PAGES = 'club record procedure pages'

export const clubSameDirection: RuleProfile = {
  id: 'club-same-direction',
  version: 1,
  name: 'Club, two runs in the same direction',
  summary: 'A qualifying run, then a record run the next morning in the same direction; average of the two.',
  runs: {
    value: { count: 2, directions: 'same' },
    source: `${CLUB_PAGES}: qualifying run, then a record run the next morning, same direction`,
    certainty: 'seen',
  },
  window: {
    value: { kind: 'next-day', before: '12:00', overnightMinutes: 360 },
    source: `${CLUB_PAGES}: record run the next morning (seen); "morning" read as before noon in the event's `
      + 'zone, and "the next morning" as after an overnight impound of at least 6 h from the qualifying run, '
      + 'not minutes past midnight (our reading, common practice; confirm in the club rulebook)',
    certainty: 'seen',
  },
  impoundMinutes: {
    value: 60,
    source: `${CLUB_PAGES}: machine into impound within 1 h of its time slip`,
    certainty: 'seen',
  },
  averaging: {
    value: 'mean-of-times',
    source:
      'average of the two runs; whether of times or speeds is not settled: a profile setting, default mean of times',
    certainty: 'not settled',
  },
  figures: {
    value: { decimals: 3, rounding: 'truncate' },
    source: 'as the international profiles',
    certainty: 'from memory',
  },
  margin: {
    value: { percent: 0, inclusive: false },
    source: 'exceed the standing record',
    certainty: 'from memory',
  },
  gradientMaxPercent: { value: null, source: 'as surveyed', certainty: 'seen' },
  distances: {
    value: [
      { label: 'Flying mile', metres: '1609.344', start: 'flying' },
      { label: 'Flying kilometre', metres: '1000', start: 'flying' },
    ],
    source: 'per club: flying mile, flying km',
    certainty: 'common practice',
  },
  tailWindLimitMs: { value: null, source: 'no published wind limit found', certainty: 'not known' },
  bestPerDayOnly: { value: null, source: 'not known', certainty: 'not known' },
  massClasses: {
    value: null,
    source: 'class limits by mass to be set from the club rulebook',
    certainty: 'not known',
  },
  witnessStatements: { value: 2, source: 'default of the ratification file', certainty: 'common practice' },
  qualifying: {
    value: { mustBeatRecord: true, requalifyAfterAbort: true },
    source: `${CLUB_PAGES}: the qualifying run must itself exceed the standing record; an interrupted record run `
      + 'means qualifying again',
    certainty: 'seen',
  },
  appointments: {
    value: ['chief-timekeeper', 'chief-scrutineer'],
    source: 'the club’s chief timer and chief of inspection sign the record (common practice, from memory)',
    certainty: 'common practice',
  },
  licence: clubLicence,
  briefing: briefingRequired,
  protests: clubProtests,
  stewards: clubStewards,
  revokedBy: clubRevocation,
  postRunCheck: {
    value: false,
    source: 'not asked by default; the organiser asks for it where the rulebook does (common practice: mass or '
      + 'capacity re-measured after a record)',
    certainty: 'common practice',
  },
  classes: {
    value: [
      ...motorcycleClasses().filter(c => c.propulsion === 'electric'),
      { label: 'Electric, streamliner car', propulsion: 'electric', certainty: 'from memory' },
      { label: 'Electric, open-wheel car', propulsion: 'electric', certainty: 'from memory' },
      { label: 'Combustion, open', propulsion: 'combustion', certainty: 'from memory' },
    ],
    source: 'club practice: engine class by body class (from memory; the club\'s rulebook lists them in full); the '
      + 'organiser adapts the list',
    certainty: 'from memory',
  },
}
