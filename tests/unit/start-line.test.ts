import { describe, expect, it } from 'vitest'
import { profiles } from '#shared/rules/profiles'
import { startLineFindings, upgradeTarget, type StartLineInput } from '#shared/rules/start-line'

// The start line's checks, from the profiles' own values. The club profile's speed-graded licences (25 mph steps
// to 200 mph, then 250 mph and unlimited) are from memory of dry-lake club rulebooks; the international profiles'
// licence valid on the day with a medical is common practice (both kept as settings of the profile).
const club = profiles['club-same-direction'].licence!.value
const intl = profiles['intl-motorcycle'].licence!.value
const rider = { name: 'Test Rider', licenceNo: 'T-1', licenceExpires: '2027-06-30', licenceGrade: '150 mph',
  medicalExpires: '2027-06-30' }
const base = (x: Partial<StartLineInput>): StartLineInput => ({
  licence: club, briefingRequired: false, rider, day: '2026-12-04', expectedKmh: 200, upgrade: false, briefing: null,
  ...x,
})
const codes = (x: Partial<StartLineInput>) => startLineFindings(base(x)).map(f => f.code)

describe('licence grades by speed', () => {
  it('converts each bracket from mph exactly (1 mph = 1.609344 km/h, international yard and pound, 1959)', () => {
    expect(club.grades!.map(g => g.maxKmh)).toEqual([201.168, 241.4016, 281.6352, 321.8688, 402.336, null])
  })
  it('lets a run within the grade start, and stops one faster than it', () => {
    expect(codes({ expectedKmh: 241.4016 })).toEqual([])
    expect(codes({ expectedKmh: 241.5 })).toEqual(['licence.grade'])
    expect(startLineFindings(base({ expectedKmh: 260 }))[0]!.message)
      .toBe('grade 150 mph allows up to 241.4016 km/h; this run expects 260 km/h (a licence upgrade run to 175 mph '
        + 'may be declared)')
  })
  it('allows an upgrade run one grade up only', () => {
    expect(codes({ expectedKmh: 260, upgrade: true })).toEqual([])
    expect(codes({ expectedKmh: 300, upgrade: true })).toEqual(['licence.upgrade-too-far'])
    expect(upgradeTarget(club.grades, '150 mph')?.label).toBe('175 mph')
    expect(upgradeTarget(club.grades, 'unlimited')).toBeNull()
    expect(upgradeTarget(intl.grades, null)).toBeNull()
  })
  it('stops a rider with no grade, or one not of the profile, and a run with no expected speed', () => {
    expect(codes({ rider: { ...rider, licenceGrade: null } })).toEqual(['licence.no-grade'])
    expect(codes({ rider: { ...rider, licenceGrade: 'B' } })).toEqual(['licence.no-grade'])
    expect(codes({ expectedKmh: null })).toEqual(['licence.speed-unknown'])
    // The grade is read as written on the licence, case aside.
    expect(codes({ rider: { ...rider, licenceGrade: '150 MPH' } })).toEqual([])
  })
})

describe('licence, medical and briefing on the day', () => {
  it('holds a licence valid through its last day, not after it', () => {
    expect(codes({ day: '2027-06-30' })).toEqual([])
    expect(codes({ day: '2027-07-01' })).toEqual(['licence.expired'])
  })
  it('asks for a valid medical where the profile requires one (international), not where it does not (club)', () => {
    const none = { ...rider, medicalExpires: null }
    expect(codes({ licence: intl, rider: none })).toEqual(['licence.medical'])
    expect(codes({ licence: intl, rider: { ...rider, medicalExpires: '2026-12-03' } })).toEqual(['licence.medical'])
    expect(codes({ licence: club, rider: none })).toEqual([])
    // No grade asked under the international profile: the expected speed does not matter.
    expect(codes({ licence: intl, expectedKmh: 1000 })).toEqual([])
  })
  it('stops a rider who did not sign on to the latest briefing, where one was held', () => {
    const briefing = { title: 'Riders\' briefing', heldAtLocal: '2026-12-04 07:00', signedOn: false }
    expect(codes({ briefing, briefingRequired: true })).toEqual(['briefing.missed'])
    expect(codes({ briefing: { ...briefing, signedOn: true }, briefingRequired: true })).toEqual([])
    expect(codes({ briefing, briefingRequired: false })).toEqual([])
  })
})
