import { describe, expect, it } from 'vitest'
import { gradeIndex, reachedFindings, startLineFindings, upgradeTarget, type StartLineInput } from '#shared/rules/start-line'
import { profiles } from '#shared/rules/profiles'
import { isTimeZone, localDate, localDateTime, localToInstant } from '#shared/rules/zoned'

// The start line's checks at their edges, with every message as the clerk of the course reads it. The club's
// brackets are 25 mph steps to 200 mph, then 250 mph and unlimited (dry-lake club rulebooks, from memory); a licence
// and a medical are valid through their last day (common practice).
const grades = profiles['club-same-direction'].licence!.value.grades!
const base: StartLineInput = {
  licence: { grades, medical: false },
  briefingRequired: true,
  rider: { name: 'R. Test', licenceNo: 'L-1', licenceExpires: '2026-12-05', licenceGrade: '200 mph', medicalExpires: null },
  day: '2026-12-05',
  expectedKmh: 300,
  upgrade: false,
  briefing: { title: 'riders\' briefing', heldAtLocal: '07:00', signedOn: true },
}
const check = (x: Partial<StartLineInput> & { rider?: Partial<StartLineInput['rider']> }) =>
  startLineFindings({ ...base, ...x, rider: { ...base.rider, ...x.rider } })

describe('licence and medical by date', () => {
  it('a licence valid through its last day; the day after, expired, said with its number', () => {
    expect(check({})).toEqual([])
    expect(check({ day: '2026-12-06' })).toEqual([{ code: 'licence.expired', message: 'R. Test\'s licence L-1 expired on 2026-12-05' }])
  })
  it('a medical where the profile asks for one: valid through its last day, named when missing', () => {
    const intl = { licence: { grades: null, medical: true } }
    expect(check({ ...intl, rider: { medicalExpires: '2026-12-05' } })).toEqual([])
    expect(check({ ...intl, rider: { medicalExpires: '2026-12-04' } }))
      .toEqual([{ code: 'licence.medical', message: 'R. Test\'s medical expired on 2026-12-04' }])
    expect(check({ ...intl, rider: { medicalExpires: null } }))
      .toEqual([{ code: 'licence.medical', message: 'no medical recorded for R. Test; the profile requires one' }])
    // No licence rule at all (an older frozen copy): only the expiry.
    expect(check({ licence: null, rider: { medicalExpires: null, licenceGrade: null } })).toEqual([])
  })
})

describe('grades by speed (200 mph = 321.8688 km/h)', () => {
  it('lets a run at the grade\'s ceiling start, and stops one a thousandth over, offering the upgrade', () => {
    expect(check({ expectedKmh: 321.8688 })).toEqual([])
    expect(check({ expectedKmh: 321.869 })).toEqual([{ code: 'licence.grade',
      message: 'grade 200 mph allows up to 321.8688 km/h; this run expects 321.869 km/h (a licence upgrade run to 250 mph may be declared)' }])
    // Beyond the next grade too: no upgrade offered.
    expect(check({ expectedKmh: 402.337 })).toEqual([{ code: 'licence.grade',
      message: 'grade 200 mph allows up to 321.8688 km/h; this run expects 402.337 km/h' }])
  })
  it('an upgrade run goes one grade up, no further', () => {
    expect(check({ expectedKmh: 402.336, upgrade: true })).toEqual([])
    expect(check({ expectedKmh: 402.337, upgrade: true })).toEqual([{ code: 'licence.upgrade-too-far',
      message: 'an upgrade run goes one grade up: 250 mph (up to 402.336 km/h), not 402.337 km/h' }])
    // From 250 mph the next grade is unlimited; unlimited has none above, and needs none.
    expect(check({ expectedKmh: 900, upgrade: true, rider: { licenceGrade: '250 mph' } })).toEqual([])
    expect(check({ expectedKmh: 900, rider: { licenceGrade: 'unlimited' } })).toEqual([])
    expect(check({ expectedKmh: 450, rider: { licenceGrade: '250 mph' } })).toEqual([{ code: 'licence.grade',
      message: 'grade 250 mph allows up to 402.336 km/h; this run expects 450 km/h (a licence upgrade run to unlimited may be declared)' }])
    const top = [{ label: 'A', maxKmh: 100 }]
    expect(check({ licence: { grades: top, medical: false }, expectedKmh: 101, upgrade: true, rider: { licenceGrade: 'A' } }))
      .toEqual([{ code: 'licence.upgrade-too-far', message: 'an upgrade run goes one grade up: none above, not 101 km/h' }])
    const unlimitedNext = [{ label: 'A', maxKmh: 100 }, { label: 'B', maxKmh: null }]
    expect(check({ licence: { grades: unlimitedNext, medical: false }, expectedKmh: 101, rider: { licenceGrade: 'A' } })[0]!.message)
      .toBe('grade A allows up to 100 km/h; this run expects 101 km/h (a licence upgrade run to B may be declared)')
  })
  it('finds the grade whatever its case and spaces; the first grade counts', () => {
    expect(gradeIndex(grades, ' 125 MPH ')).toBe(0)
    expect(gradeIndex(grades, null)).toBe(-1)
    expect(check({ expectedKmh: 201.168, rider: { licenceGrade: '125 mph' } })).toEqual([])
    expect(upgradeTarget(grades, '125 mph')).toEqual(grades[1])
    expect(upgradeTarget(grades, 'unlimited')).toBeNull()
    expect(upgradeTarget(grades, 'no such')).toBeNull()
    expect(upgradeTarget(null, '125 mph')).toBeNull()
    expect(upgradeTarget([], '125 mph')).toBeNull()
  })
  it('names a missing or foreign grade, and a run with no expected speed', () => {
    expect(check({ rider: { licenceGrade: null } }))
      .toEqual([{ code: 'licence.no-grade', message: 'no licence grade recorded for R. Test' }])
    expect(check({ rider: { licenceGrade: 'Class A' } })).toEqual([{ code: 'licence.no-grade',
      message: 'licence grade “Class A” is not a grade of this profile (125 mph, 150 mph, 175 mph, 200 mph, 250 mph, unlimited)' }])
    expect(check({ expectedKmh: null })).toEqual([{ code: 'licence.speed-unknown',
      message: 'no expected speed: say it at the start, or declare it at inspection' }])
  })
})

describe('the riders\' briefing', () => {
  it('stops a rider who did not sign on to the latest briefing, where the profile asks for it', () => {
    expect(check({ briefing: { ...base.briefing!, signedOn: false } })).toEqual([{ code: 'briefing.missed',
      message: 'R. Test did not sign on to the riders\' briefing (07:00)' }])
    expect(check({ briefingRequired: false, briefing: { ...base.briefing!, signedOn: false } })).toEqual([])
    // Where the profile asks for one and none has been held before the start, nobody runs (common practice: the
    // clerk of the course briefs the riders before the first run).
    expect(check({ briefing: null })).toEqual([{ code: 'briefing.none',
      message: 'no riders\' briefing has been held before this start; the profile requires one before any run' }])
    expect(check({ briefingRequired: false, briefing: null })).toEqual([])
  })
})

describe('zones and local times (IANA time zone database)', () => {
  it('knows a zone name, and refuses one that is not', () => {
    expect(isTimeZone('Europe/Paris')).toBe(true)
    expect(isTimeZone('Mars/Olympus')).toBe(false)
    expect(isTimeZone('Europe/Paris')).toBe(true)
  })
  it('reads a wall-clock time to the millisecond, and refuses anything else', () => {
    // Paris is UTC+1 in December.
    expect(localToInstant('2026-12-05T10:00', 'Europe/Paris')).toBe(Date.parse('2026-12-05T09:00:00Z'))
    expect(localToInstant('2026-12-05T10:00:05', 'Europe/Paris')).toBe(Date.parse('2026-12-05T09:00:05Z'))
    expect(localToInstant('2026-12-05T10:00:05.5', 'Europe/Paris')).toBe(Date.parse('2026-12-05T09:00:05.500Z'))
    expect(localToInstant('2026-12-05T10:00:05.123', 'Europe/Paris')).toBe(Date.parse('2026-12-05T09:00:05.123Z'))
    for (const bad of ['2026-12-05 10:00', 'x2026-12-05T10:00', '2026-12-05T10:00x', '2026-12-05T10:00:05.1234', '2026-12-05']) {
      expect(() => localToInstant(bad, 'Europe/Paris'), bad).toThrow(`not a local date and time: ${bad}`)
    }
  })
  it('writes early years and single digits with their zeros', () => {
    expect(localDate(Date.UTC(999, 0, 2, 12), 'UTC')).toBe('0999-01-02')
    expect(localDateTime(Date.UTC(2026, 0, 2, 3, 4, 5), 'UTC')).toBe('2026-01-02 03:04:05')
  })
})

describe('the speed reached, before the next run', () => {
  // Safety is judged on the speed the machine reached, not only on the speed declared (common practice): over the
  // licence grade's ceiling (unless on an upgrade run), over the tyres' rated speed, or needing more parachutes than
  // fitted stops the next start until the clerk of the course decides. Grade 250 mph = 402.336 km/h; parachutes one
  // over 175 mph = 281.6352 km/h and two over 300 mph = 482.8032 km/h (club rules, from memory; 1 mph = 1.609344 km/h
  // exactly, NIST SP 811).
  const grade = { label: '250 mph', maxKmh: 402.336 }
  const steps = [{ overMph: 175, count: 1 }, { overMph: 300, count: 2 }]
  const at = (kmh: string, x: { upgrade?: boolean } = {}) => ({ kmh, runId: 7, upgrade: !!x.upgrade })
  const base = { reached: at('402.336'), grade, tyreRatedKmh: 420, parachutes: { fitted: 1, steps } }
  it('is nothing at the ceilings themselves, and before a first timed run', () => {
    expect(reachedFindings(base)).toEqual([])
    expect(reachedFindings({ ...base, reached: at('420'), grade: null })).toEqual([])
    expect(reachedFindings({ ...base, reached: at('482.8032'), grade: null, tyreRatedKmh: null })).toEqual([])
    expect(reachedFindings({ ...base, reached: null, tyreRatedKmh: 1 })).toEqual([])
  })
  it('names the grade, the tyres and the parachutes just over each', () => {
    expect(reachedFindings({ ...base, reached: at('402.337') })).toEqual([{ code: 'reached.licence-grade',
      message: 'run #7 reached 402.337 km/h, over the 402.336 km/h of licence grade 250 mph' }])
    expect(reachedFindings({ ...base, reached: at('402.337', { upgrade: true }) })).toEqual([])
    expect(reachedFindings({ ...base, grade: null, reached: at('420.001') })).toEqual([{ code: 'reached.tyre-rating',
      message: 'run #7 reached 420.001 km/h, over its tyres\' rated 420 km/h' }])
    expect(reachedFindings({ ...base, grade: null, tyreRatedKmh: null, reached: at('482.8033') })).toEqual([{
      code: 'reached.parachutes', message: 'run #7 reached 482.8033 km/h, at which 2 parachute(s) are needed; 1 fitted at inspection' }])
    // Under 175 mph none is needed: a machine with none fitted is not stopped there, and is just over it.
    const none = { ...base, grade: null, tyreRatedKmh: null, parachutes: { fitted: 0, steps } }
    expect(reachedFindings({ ...none, reached: at('281.6352') })).toEqual([])
    expect(reachedFindings({ ...none, reached: at('281.6353') }).map(f => f.code)).toEqual(['reached.parachutes'])
  })
  it('holds nothing against an unlimited grade, or where no parachute was asked (not applicable)', () => {
    // The club scheme's top grade has no ceiling (from memory of dry-lake club rulebooks); an unstreamlined machine's
    // parachute item is not applicable, so there is no count to hold the speed against.
    const unlimited = { label: 'unlimited', maxKmh: null }
    expect(reachedFindings({ ...base, grade: unlimited, tyreRatedKmh: null, parachutes: null, reached: at('999.999') })).toEqual([])
  })
})
