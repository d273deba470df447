import { describe, expect, it } from 'vitest'
import { profiles } from '#shared/rules/profiles'
import { describeRuleValue, describeWindow, revokedByOf, ruleLabels, stewardsQuorum } from '#shared/rules/profile'

// Each rule value as the rules page and the dossier print it, read off the profiles by hand: the international
// motorcycle rule (FIM world records page, seen: two runs in opposite directions within 2 h, distance over the mean
// time, 3 decimals truncated, gradient at most 1 %), the international automobile rule (FIA Appendix D, seen: 60 min,
// at least 1 % over the record) and the club's (a qualifying run, the record run next morning before noon).
const moto = profiles['intl-motorcycle']
const auto = profiles['intl-automobile']
const club = profiles['club-same-direction']
const words = (p: typeof moto, k: keyof typeof ruleLabels) => describeRuleValue(k, p[k]!.value)

describe('rule values in words', () => {
  it('the runs and their window', () => {
    expect(words(moto, 'runs')).toBe('2, opposite directions')
    expect(words(club, 'runs')).toBe('2, same directions')
    expect(words(moto, 'window')).toBe('120 min from the start of the first run to the finish of the second run')
    expect(words(auto, 'window')).toBe('60 min from the start of the first run to the finish of the second run')
    expect(words(club, 'window')).toBe('record run on the calendar day after the qualifying run, at least 6 h after it, leaving before 12:00')
    expect(describeWindow({ kind: 'next-day' })).toBe('record run on the calendar day after the qualifying run')
    expect(describeWindow({ kind: 'elapsed', minutes: 30, from: 'finish-first', to: 'start-second' }))
      .toBe('30 min from the finish of the first run to the start of the second run')
  })

  it('the result, the figures and the margin', () => {
    expect(words(moto, 'averaging')).toBe('distance over the mean of the times')
    expect(describeRuleValue('averaging', 'mean-of-speeds')).toBe('mean of the speeds')
    expect(words(moto, 'figures')).toBe('3 decimals, truncated')
    expect(describeRuleValue('figures', { decimals: 2, rounding: 'round' })).toBe('2 decimals, rounded')
    expect(words(moto, 'margin')).toBe('exceed the standing record')
    expect(words(auto, 'margin')).toBe('at least 1 % over the standing record')
  })

  it('the course: distances, gradient and wind', () => {
    expect(words(auto, 'distances')).toBe('Flying kilometre (1000 m); Flying mile (1609.344 m)')
    expect(words(moto, 'gradientMaxPercent')).toBe('at most 1 %')
    expect(words(auto, 'gradientMaxPercent')).toBe('none')
    expect(words(moto, 'tailWindLimitMs')).toBe('none')
    expect(describeRuleValue('tailWindLimitMs', 2)).toBe('at most 2 m/s')
    expect(describeRuleValue('tailWindLimitMs', undefined)).toBe('none')
  })

  it('impound, best of the day, mass classes, statements and the post-run check', () => {
    expect(words(club, 'impoundMinutes')).toBe('60 min')
    expect(words(moto, 'impoundMinutes')).toBe('none')
    expect(words(moto, 'bestPerDayOnly')).toBe('only the best result per class each day goes forward')
    expect(describeRuleValue('bestPerDayOnly', false)).toBe('every result goes forward')
    expect(describeRuleValue('massClasses', [{ label: 'Light', maxKg: 300 }, { label: 'Open', maxKg: null }]))
      .toBe('Light (up to 300 kg); Open')
    expect(words(moto, 'witnessStatements')).toBe('2')
    expect(words(moto, 'postRunCheck')).toBe('none')
    expect(describeRuleValue('postRunCheck', true))
      .toBe('the machine is checked again after the record run (mass re-measured), signed')
  })

  it('the qualifying run of the club procedure', () => {
    expect(words(club, 'qualifying'))
      .toBe('the qualifying run must itself beat the standing record; an aborted record run means qualifying again')
    expect(describeRuleValue('qualifying', { mustBeatRecord: false, requalifyAfterAbort: false })).toBe('any qualifying run')
    expect(words(moto, 'qualifying')).toBe('none')
  })

  it('officials, classes, licences, the briefing and protests', () => {
    expect(words(club, 'appointments')).toBe('Chief timekeeper; Chief scrutineer')
    expect(words(moto, 'appointments'))
      .toBe('Clerk of the course; Chief timekeeper; Chief scrutineer; Observer of the sanctioning body')
    expect(describeRuleValue('appointments', [])).toBe('none')
    expect(words(auto, 'classes')).toBe('4 classes: Electric automobile, up to 500 kg; Electric automobile, over 500 kg '
      + 'up to 1000 kg; Electric automobile, over 1000 kg; Combustion automobile, open')
    expect(words(moto, 'licence')).toBe('a licence valid on the day of the run; a valid medical')
    // The club's brackets: 125, 150, 175, 200 and 250 mph, exactly converted (1 mph = 1.609344 km/h), then unlimited.
    expect(words(club, 'licence')).toBe('graded by speed: 125 mph (to 201.168 km/h); 150 mph (to 241.4016 km/h); '
      + '175 mph (to 281.6352 km/h); 200 mph (to 321.8688 km/h); 250 mph (to 402.336 km/h); unlimited (no limit); '
      + 'an upgrade run goes one grade up')
    expect(words(moto, 'briefing')).toBe('each rider signs on to the latest briefing before running')
    expect(describeRuleValue('briefing', false)).toBe('not required')
    expect(words(club, 'protests')).toBe('protest within 60 min of publication; fee: set by the club; appeal to the '
      + 'club\'s board, by 12:00 the next day, event\'s clock of the decision')
    expect(describeRuleValue('protests', { lodge: { kind: 'clock', at: '18:00', daysAfter: 0 }, fee: null, appeal: null }))
      .toBe('protest by 18:00 the same day, event\'s clock of publication; no fee; no appeal')
    expect(describeRuleValue('protests', { lodge: { kind: 'clock', at: '09:00', daysAfter: 2 }, fee: null, appeal: null }))
      .toBe('protest by 09:00 2 days later, event\'s clock of publication; no fee; no appeal')
  })

  it('the stewards\' quorum: one steward, or several, each signing', () => {
    // Two of a panel of three (international sporting codes, from memory); one at a club meet (a profile setting).
    expect(words(moto, 'stewards')).toBe('signed by 2 appointed stewards')
    expect(words(auto, 'stewards')).toBe('signed by 2 appointed stewards')
    expect(words(club, 'stewards')).toBe('signed by an appointed steward')
    expect(stewardsQuorum(moto)).toBe(2)
    expect(stewardsQuorum(club)).toBe(1)
    // A copy frozen before the rule existed: one steward, as before.
    expect(stewardsQuorum({})).toBe(1)
  })

  it('who revokes a ratification: the body\'s observer internationally, a steward at a club meet', () => {
    expect(words(moto, 'revokedBy')).toBe('signed by the appointed observer of the sanctioning body, with reasons')
    expect(words(club, 'revokedBy')).toBe('signed by the appointed steward, with reasons')
    expect(revokedByOf(auto)).toBe('observer')
    // A copy frozen before the rule existed: a steward.
    expect(revokedByOf({})).toBe('steward')
  })

  it('labels every rule', () => {
    expect(ruleLabels.window).toBe('Time window')
    expect(ruleLabels.tailWindLimitMs).toBe('Tail-wind limit')
    expect(ruleLabels.stewards).toBe('Stewards\' decisions')
    expect(ruleLabels.revokedBy).toBe('Revoking a ratification')
    expect(Object.keys(ruleLabels)).toHaveLength(21)
  })
})
