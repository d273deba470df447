import { describe, expect, it } from 'vitest'
import { checkMeasurement, clears, missingItems, toItemUnit, allItems } from '#shared/inspection/evaluate'
import {
  combustionAutomobile,
  combustionMotorcycle,
  electricAutomobile,
  electricMotorcycle,
  electricStreamliner,
} from '#shared/inspection/templates'

const item = (key: string) => allItems(electricMotorcycle).find(i => i.key === key)!

describe('isolation resistance per volt', () => {
  // Source: UN ECE Regulation 100, 5.1.3: isolation resistance at least 100 Ω per volt of working
  // voltage for DC buses and 500 Ω per volt for AC buses.
  it('a 400 V DC bus needs at least 40 kΩ', () => {
    expect(checkMeasurement(item('isolation'), 40_000, { busVoltageV: 400, busKind: 'dc' }).withinLimit).toBe(true)
    expect(checkMeasurement(item('isolation'), 39_999, { busVoltageV: 400, busKind: 'dc' }).withinLimit).toBe(false)
  })

  it('a 230 V AC bus needs at least 115 kΩ', () => {
    expect(checkMeasurement(item('isolation'), 115_000, { busVoltageV: 230, busKind: 'ac' }).withinLimit).toBe(true)
    const low = checkMeasurement(item('isolation'), 100_000, { busVoltageV: 230, busKind: 'ac' })
    expect(low.withinLimit).toBe(false)
    // 100 000 / 230 = 434.78…, shown truncated so that a failing figure never prints as the limit.
    expect(low.message).toBe('434.7 Ω/V at 230 V AC is under the 500 Ω/V needed')
  })

  it('cannot judge without the bus voltage', () => {
    expect(checkMeasurement(item('isolation'), 1e6, {}).withinLimit).toBeNull()
  })
})

describe('measurements', () => {
  it('converts kΩ and MΩ and refuses other units', () => {
    expect(toItemUnit(item('isolation'), 2.4, 'MΩ')).toBe('2400000')
    expect(toItemUnit(item('bonding'), 30, 'mΩ')).toBe('0.03')
    expect(toItemUnit(item('bonding'), '0.1', 'Ω')).toBe('0.1')
    expect(() => toItemUnit(item('isolation'), 400, 'V')).toThrow(/must be in Ω, kΩ, MΩ, mΩ/)
  })

  it('converts pounds, miles per hour and cubic inches exactly', () => {
    // 1 lb = 0.45359237 kg and 1 mile = 1.609344 km exactly (international yard and pound agreement of
    // 1959; NIST SP 811, appendix B): 250 lb = 113.3980925 kg, 186.4 mph = 299.9817216 km/h.
    expect(toItemUnit(item('mass'), 250, 'lb')).toBe('113.3980925')
    expect(toItemUnit(item('tyres-rated'), '186.4', 'mph')).toBe('299.9817216')
    // 1 in = 2.54 cm exactly, so 1 in³ = 16.387064 cm³ (same agreement): 61 in³ = 999.610904 cm³.
    const capacity = allItems(combustionMotorcycle).find(i => i.key === 'engine-capacity')!
    expect(toItemUnit(capacity, 61, 'in³')).toBe('999.610904')
    expect(toItemUnit(capacity, '0.999', 'L')).toBe('999')
  })

  it('refuses a count with a fraction, a negative value and more than six decimals', () => {
    expect(() => toItemUnit(item('parachute'), '1.5', 'count')).toThrow(/whole number/)
    expect(() => toItemUnit(item('mass'), '-1', 'kg')).toThrow(/negative/)
    expect(() => toItemUnit(item('mass'), '1.1234567', 'kg')).toThrow(/at most 6 decimals/)
  })

  it('bonding of exposed conductive parts below 0.1 Ω (published safety-standard extracts)', () => {
    expect(checkMeasurement(item('bonding'), 0.09, {}).withinLimit).toBe(true)
    // "Below": 0.1 Ω itself is not below it.
    expect(checkMeasurement(item('bonding'), 0.1, {}).withinLimit).toBe(false)
    expect(checkMeasurement(item('bonding'), 0.11, {}).withinLimit).toBe(false)
  })
})

describe('clearance', () => {
  // Values within every limit: isolation 80 kΩ on a 400 V DC bus is 200 Ω/V (≥ 100 Ω/V, UN ECE R100 5.1.3);
  // bonding 0.05 Ω (< 0.1 Ω); rider out in 12 s (≤ 30 s reported); mass measured.
  // Declared 290 km/h (180.2 mph): one parachute needed (over 175 mph, club rules, from memory); tyres
  // rated 300 km/h (speed symbol Y, from memory).
  const values: Record<string, number> = {
    'isolation': 80_000, 'bonding': 0.05, 'canopy-exit': 12, 'mass': 181.5, 'parachute': 1, 'tyres-rated': 300,
  }
  const all = allItems(electricMotorcycle).map(i => ({ itemKey: i.key, result: 'pass' as const, value: i.kind === 'measure' ? values[i.key] ?? 1 : null }))
  const bus = { busVoltageV: 400, busKind: 'dc' as const, declaredKmh: 290 }
  it('needs a signature, every item answered and none failed', () => {
    expect(clears(electricMotorcycle, all, false, bus).cleared).toBe(false)
    expect(clears(electricMotorcycle, all, true, bus).cleared).toBe(true)
    const failed = all.map(a => (a.itemKey === 'helmet' ? { ...a, result: 'fail' as const } : a))
    expect(clears(electricMotorcycle, failed, true, bus).why).toBe('failed: Helmet to the current approved standard')
    expect(missingItems(electricMotorcycle, all.slice(1)).map(i => i.key)).toEqual(['cutoff-lanyard'])
  })

  it('a measured value outside its limit fails, whatever was ticked', () => {
    // 20 kΩ on 400 V DC is 50 Ω/V, under the 100 Ω/V of UN ECE R100 5.1.3: ticked "pass", it still fails.
    const low = all.map(a => (a.itemKey === 'isolation' ? { ...a, value: 20_000 } : a))
    const c = clears(electricMotorcycle, low, true, bus)
    expect(c.cleared).toBe(false)
    expect(c.why).toContain('50.0 Ω/V at 400 V DC is under the 100 Ω/V needed')
  })

  it('an electric machine is not cleared without its working voltage and bus kind', () => {
    const c = clears(electricMotorcycle, all, true, { declaredKmh: 290 })
    expect(c.cleared).toBe(false)
    expect(c.why).toContain('no working voltage and bus kind')
    // Even with the isolation item marked not applicable on an adapted copy, the voltage is asked for.
    const noIsolation = all.map(a => (a.itemKey === 'isolation' ? { ...a, result: 'na' as const } : a))
    expect(clears(electricMotorcycle, noIsolation, true, { declaredKmh: 290 }).why).toContain('no working voltage')
  })

  it('a missing declared speed blocks: the tyres and parachutes are judged against it', () => {
    const c = clears(electricMotorcycle, all, true, { busVoltageV: 400, busKind: 'dc' })
    expect(c.cleared).toBe(false)
    expect(c.why).toContain('declared top speed to judge: Parachutes')
  })
})

describe('connected DC and AC buses', () => {
  // Source: UN ECE Regulation 100, 5.1.3 (from memory for the connected case; confirm the wording): DC and
  // AC buses conductively connected need 500 Ω/V of the maximum working voltage, unless the AC side has the
  // additional protection the paragraph names (then 100 Ω/V). 100 kΩ at 400 V is 250 Ω/V.
  const at = (busKind: 'dc' | 'dc-ac' | 'dc-ac-protected') =>
    checkMeasurement(item('isolation'), 100_000, { busVoltageV: 400, busKind }).withinLimit
  it('needs 500 Ω/V when connected, 100 Ω/V with the AC side protected', () => {
    expect(at('dc')).toBe(true)
    expect(at('dc-ac')).toBe(false)
    expect(at('dc-ac-protected')).toBe(true)
    // A typical 400 V machine at a fifth of what connected buses need: 40 kΩ = 100 Ω/V < 500 Ω/V.
    expect(checkMeasurement(item('isolation'), 40_000, { busVoltageV: 400, busKind: 'dc-ac' }).message)
      .toBe('100.0 Ω/V at 400 V DC and AC connected is under the 500 Ω/V needed')
  })
})

describe('the templates cover the safety items', () => {
  it('each names its source or says it is common practice, and the safety items are marked', () => {
    const keys = allItems(electricMotorcycle).map(i => i.key)
    // Common practice of record scrutineering, and UN ECE Regulation 100 for the high-voltage items.
    for (const k of ['cutoff-lanyard', 'isolation', 'hv-service-disconnect', 'hv-warning-labels', 'isolation-monitoring', 'make-safe-procedure', 'fire-extinguisher', 'parachute', 'tyres-rated', 'ballast-secured', 'helmet']) {
      expect(keys).toContain(k)
      expect(item(k).safety).toBe(true)
    }
    // Every item carries its source: tests/unit/sources.test.ts.
  })
})

describe('automobile and streamliner templates', () => {
  it('carry the driver-safety items and, for the streamliner, the escape with the canopy shut', () => {
    // Common practice of record scrutineering: roll structure, restraints, fire suppression; a streamliner's
    // driver must get out unaided with the canopy shut (30 s reported).
    for (const t of [electricAutomobile, electricStreamliner]) {
      const keys = allItems(t).map(i => i.key)
      expect(keys).toEqual(expect.arrayContaining(['roll-structure', 'restraints', 'fire-suppression', 'isolation']))
      expect(new Set(keys).size).toBe(keys.length)
    }
    const exit = allItems(electricStreamliner).find(i => i.key === 'cockpit-exit')!
    expect(checkMeasurement(exit, 31, {}).withinLimit).toBe(false)
    expect(checkMeasurement(exit, 22, {}).withinLimit).toBe(true)
  })
})

describe('the declared speed decides tyres and parachutes', () => {
  // Club rules (from memory, a setting of the template): one parachute above 175 mph, two above 300 mph.
  // 175 mph = 281.6352 km/h exactly (1 mile = 1.609344 km, NIST SP 811).
  it('counts the parachutes needed at the declared speed, exactly at the step', () => {
    expect(checkMeasurement(item('parachute'), 0, { declaredKmh: '281.6352' }).withinLimit).toBe(true)
    expect(checkMeasurement(item('parachute'), 0, { declaredKmh: '281.6353' }).withinLimit).toBe(false)
    expect(checkMeasurement(item('parachute'), 1, { declaredKmh: 490 }).message)
      .toBe('1 fitted, 2 needed at 490 km/h: too few')
    expect(checkMeasurement(item('parachute'), 2, { declaredKmh: 490 }).withinLimit).toBe(true)
  })

  it('fails a tyre rated under the declared speed, and cannot judge without it', () => {
    // Speed symbol W = 270 km/h (ETRTO / ISO 4000-1, from memory) on a machine declared at 290 km/h.
    expect(checkMeasurement(item('tyres-rated'), 270, { declaredKmh: 290 }).withinLimit).toBe(false)
    expect(checkMeasurement(item('tyres-rated'), 300, { declaredKmh: 290 }).withinLimit).toBe(true)
    expect(checkMeasurement(item('tyres-rated'), 300, {}).withinLimit).toBeNull()
  })

  it('a combustion car records its engine capacity and needs no working voltage', () => {
    const answers = allItems(combustionAutomobile).map(i => ({
      itemKey: i.key,
      result: 'pass' as const,
      value: i.kind === 'measure' ? ({ 'parachute': 1, 'tyres-rated': 300, 'engine-capacity': 1998 } as Record<string, number>)[i.key] ?? 10 : null,
    }))
    expect(clears(combustionAutomobile, answers, true, { declaredKmh: 290 })).toEqual({
      cleared: true,
      why: 'signed inspection, every item passed and every measurement within its limit',
    })
  })
})
