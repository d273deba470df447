import { describe, expect, it } from 'vitest'
import { CHECKLIST_CAUTION } from '#shared/inspection/template'
import { planOf } from '#shared/rules/planner/request'
import { copyProfile, profiles } from '#shared/rules/profiles'

// Small parts the pages and the dossier rest on.
describe('the checklist caution', () => {
  it('says who decides, as every checklist page and report prints it (the product\'s safety caution)', () => {
    expect(CHECKLIST_CAUTION).toBe('This checklist is a template. The applicable rulebook, the chief scrutineer and qualified '
      + 'high-voltage practice decide; Trapline records the inspection, it does not certify safety.')
  })
})

describe('a plan request as the form sends it', () => {
  it('plans with the profile named by its id, and names it', () => {
    const r = planOf({
      machine: { massKg: 230, rotatingMassKg: 20, cdA: 0.01, crr: 0, efficiency: 1, power: { kind: 'constant', kW: 100_000 }, maxTractiveN: 500 },
      conditions: { altitudeM: 0, temperatureC: 15, pressureHpa: 1013.25, windMs: 0, windFromDeg: 0 },
      course: { label: 'Flying kilometre', lengthM: 8000, headingDeg: 0, entryM: 3500, exitM: 4500 },
      shutdown: { decelerationMs2: 3, marginM: 300 },
      profileId: 'intl-automobile', recordKmh: 400, turnaroundMin: 45,
    })
    expect(r.profile).toBe('International automobile')
    expect(r.input.profile).toBe(profiles['intl-automobile'])
    expect(r.input.recordKmh).toBe(400)
    // The automobile rule's 1 % margin: 404 km/h needed.
    expect(r.plan.record!.requiredKmh).toBeCloseTo(404, 9)
    expect(r.input.course.exitM).toBe(4500)
  })
})

describe('a profile copied to adapt', () => {
  it('is a deep copy with the changes over it; the library\'s profile is untouched', () => {
    const copy = copyProfile(profiles['intl-motorcycle'], { gradientMaxPercent: { value: 2, source: 'test rulebook, art. 8', certainty: 'seen' } })
    expect(copy.gradientMaxPercent.value).toBe(2)
    expect(copy.window).toEqual(profiles['intl-motorcycle'].window)
    expect(copy.window).not.toBe(profiles['intl-motorcycle'].window)
    copy.distances.value.push({ label: 'X', metres: '1', start: 'flying' })
    expect(profiles['intl-motorcycle'].distances.value).toHaveLength(5)
    expect(profiles['intl-motorcycle'].gradientMaxPercent.value).toBe(1)
  })
})

describe('a payment\'s state in words', () => {
  // One wording on every page (a decline is not a cancellation): the provider's states pending, paid, failed
  // (declined), cancelled (the page left), and the fee's own unpaid and refunded.
  it('names each state once, a declined card as declined, and says nothing was charged where nothing was', async () => {
    const { PAYMENT_STATE_WORDS } = await import('#shared/utils/payment-words')
    expect(Object.keys(PAYMENT_STATE_WORDS).sort()).toEqual(['cancelled', 'failed', 'paid', 'pending', 'refunded', 'unpaid'])
    expect(PAYMENT_STATE_WORDS.failed).toBe('✕ declined: nothing was charged')
    expect(PAYMENT_STATE_WORDS.cancelled).toContain('nothing was charged')
    expect(PAYMENT_STATE_WORDS.cancelled).not.toContain('declined')
  })
})
