import { describe, expect, it } from 'vitest'
import { allItems, checklistMismatch, checkMeasurement, clears, countNeeded, measuredVerdicts, missingItems, notApplicableMisused, notApplicableRefusal, toItemUnit } from '#shared/inspection/evaluate'
import { combustionMotorcycle, electricMotorcycle, electricStreamliner, PARACHUTE_STEPS } from '#shared/inspection/templates'
import type { ChecklistItem } from '#shared/inspection/template'
import { fromDecimal } from '#shared/rules/exact'

// Every limit of the checklists exactly at it, one unit inside and one outside. Isolation: 100 Ω/V on a DC bus,
// 500 Ω/V on an AC bus (UN ECE Regulation 100, 5.1.3); bonding below 0.1 Ω (UN ECE R100 and published extracts, from
// memory: "below", so 0.1 Ω itself fails); canopy
// exit at most 30 s (as reported); tyres rated at least the declared speed; parachutes by declared speed, one over
// 175 mph and two over 300 mph (club rules, from memory). 1 mph = 1.609344 km/h exactly (NIST SP 811).
const item = (key: string, t = electricMotorcycle) => allItems(t).find(i => i.key === key)!
const verdict = (key: string, value: number | string | null, figures = {}) => checkMeasurement(item(key), value, figures)

describe('isolation per volt at its edges', () => {
  it.each([
    // 400 V DC: 100 Ω/V is 40 000 Ω.
    [40_000, 'dc', true, '100.0 Ω/V at 400 V DC, at least 100 Ω/V needed'],
    ['39999.999999', 'dc', false, '99.9 Ω/V at 400 V DC is under the 100 Ω/V needed'],
    // 400 V AC: 500 Ω/V is 200 000 Ω.
    [200_000, 'ac', true, '500.0 Ω/V at 400 V AC, at least 500 Ω/V needed'],
    [199_999, 'ac', false, '499.9 Ω/V at 400 V AC is under the 500 Ω/V needed'],
    // Connected buses need the AC value, unless the AC side has the additional protection (then the DC value).
    [40_000, 'dc-ac', false, '100.0 Ω/V at 400 V DC and AC connected is under the 500 Ω/V needed'],
    [40_000, 'dc-ac-protected', true, '100.0 Ω/V at 400 V DC and AC connected, AC side with the additional protection, at least 100 Ω/V needed'],
  ] as const)('%s Ω at 400 V %s: within %s', (ohms, busKind, within, message) => {
    expect(verdict('isolation', ohms, { busVoltageV: 400, busKind })).toEqual({ withinLimit: within, message })
  })
  it('cannot be judged without a positive working voltage and the bus kind', () => {
    const asks = 'enter the working voltage and whether the bus is DC or AC to check the isolation'
    expect(verdict('isolation', 40_000, { busKind: 'dc' })).toEqual({ withinLimit: null, message: asks })
    expect(verdict('isolation', 40_000, { busVoltageV: 0, busKind: 'dc' })).toEqual({ withinLimit: null, message: asks })
    expect(verdict('isolation', 40_000, { busVoltageV: 400 })).toEqual({ withinLimit: null, message: asks })
    expect(verdict('isolation', 40_000, { busVoltageV: '', busKind: 'dc' })).toEqual({ withinLimit: null, message: asks })
  })
})

describe('maximum limits: bonding below 0.1 Ω, canopy exit 30 s', () => {
  it.each([
    ['bonding', '0.099999', true, null],
    ['bonding', '0.1', false, '0.1 Ω is not below 0.1 Ω'], ['bonding', '0.100', false, '0.1 Ω is not below 0.1 Ω'],
    ['bonding', '0.100001', false, '0.100001 Ω is not below 0.1 Ω'],
    ['canopy-exit', 30, true, null], ['canopy-exit', '29.999', true, null],
    ['canopy-exit', '30.001', false, '30.001 s is over the limit of 30 s'],
  ] as const)('%s at %s: within %s', (key, value, within, message) => {
    expect(verdict(key, value)).toEqual({ withinLimit: within, message })
  })
  it('a minimum limit passes at it and fails under it (a limit kind the organiser\'s copies may use)', () => {
    const min: ChecklistItem = { key: 'ground-clearance', label: 'Ground clearance', kind: 'measure', unit: 'kg',
      limit: { kind: 'min', value: 50 }, source: 'test rulebook, art. 2', certainty: 'seen' }
    expect(checkMeasurement(min, 50, {})).toEqual({ withinLimit: true, message: null })
    expect(checkMeasurement(min, '49.999', {})).toEqual({ withinLimit: false, message: '49.999 kg is under the minimum of 50 kg' })
  })
  it('a recorded value is noted, not judged; a check item or an empty value is not judged', () => {
    expect(verdict('mass', '181.5')).toEqual({ withinLimit: null, message: '181.5 kg recorded' })
    expect(verdict('bonding', null)).toEqual({ withinLimit: null, message: null })
    expect(verdict('bonding', '')).toEqual({ withinLimit: null, message: null })
    expect(checkMeasurement(item('helmet'), 1, {})).toEqual({ withinLimit: null, message: null })
  })
})

describe('tyres rated for the declared speed', () => {
  it.each([
    [300, 300, true, 'rated 300 km/h, declared top speed 300 km/h'],
    ['300.001', 300, true, 'rated 300.001 km/h, declared top speed 300 km/h'],
    ['299.999', 300, false, 'rated 299.999 km/h, declared top speed 300 km/h: rated under the declared speed'],
  ] as const)('rated %s km/h for a declared %s km/h: within %s', (rated, declared, within, message) => {
    expect(verdict('tyres-rated', rated, { declaredKmh: declared })).toEqual({ withinLimit: within, message })
  })
  it('asks for the declared speed first', () => {
    expect(verdict('tyres-rated', 300, {})).toEqual({ withinLimit: null, message: 'enter the declared top speed to check the tyres against it' })
  })
})

describe('parachutes by declared speed', () => {
  // 175 mph = 281.6352 km/h; 300 mph = 482.8032 km/h exactly.
  it.each([
    ['281.6352', 0], ['281.6353', 1], ['482.8032', 1], ['482.8033', 2], ['100', 0],
  ] as const)('at a declared %s km/h, %i needed', (kmh, n) => {
    expect(countNeeded(PARACHUTE_STEPS, fromDecimal(kmh))).toBe(n)
  })
  it('passes the count needed and fails one fewer, saying both', () => {
    expect(verdict('parachute', 2, { declaredKmh: '482.8033' })).toEqual({ withinLimit: true, message: '2 fitted, 2 needed at 482.8033 km/h' })
    expect(verdict('parachute', 1, { declaredKmh: '482.8033' })).toEqual({ withinLimit: false, message: '1 fitted, 2 needed at 482.8033 km/h: too few' })
    expect(verdict('parachute', 0, { declaredKmh: '281.6352' })).toEqual({ withinLimit: true, message: '0 fitted, 0 needed at 281.6352 km/h' })
    expect(verdict('parachute', 1, {})).toEqual({ withinLimit: null, message: 'enter the declared top speed to check the count needed' })
  })
})

describe('a value typed in another unit, stored exactly in the item\'s unit', () => {
  it('converts, and refuses what cannot be a measurement', () => {
    expect(toItemUnit(item('isolation'), '2.4', 'MΩ')).toBe('2400000')
    expect(toItemUnit(item('bonding'), '50', 'mΩ')).toBe('0.05')
    expect(toItemUnit(item('mass'), 250, 'lb')).toBe('113.3980925')
    expect(toItemUnit(item('parachute'), '2', 'count')).toBe('2')
    expect(toItemUnit(item('bonding'), '0', 'Ω')).toBe('0')
    expect(() => toItemUnit(item('bonding'), '-0.01', 'Ω')).toThrow('must not be negative')
    expect(() => toItemUnit(item('bonding'), 'abc', 'Ω')).toThrow('must be a decimal number')
    expect(() => toItemUnit(item('bonding'), '0.1234567', 'Ω')).toThrow('must have at most 6 decimals')
    expect(toItemUnit(item('bonding'), '0.123456', 'Ω')).toBe('0.123456')
    expect(() => toItemUnit(item('parachute'), '1.5', 'count')).toThrow('must be a whole number')
    expect(() => toItemUnit(item('bonding'), '1', 'V')).toThrow('must be in Ω, kΩ, MΩ, mΩ')
  })
})

describe('what stops a signature, and what the measurements say together', () => {
  const values: Record<string, number> = { 'isolation': 80_000, 'bonding': 0.05, 'canopy-exit': 12, 'mass': 181.5, 'parachute': 1, 'tyres-rated': 300 }
  const answers = (t = electricMotorcycle) =>
    allItems(t).map(i => ({ itemKey: i.key, result: 'pass' as const, value: i.kind === 'measure' ? values[i.key] ?? 1 : null }))
  const bus = { busVoltageV: 400, busKind: 'dc' as const, declaredKmh: 290 }

  it('a measurement with no value is missing unless marked not applicable; a check needs only its answer', () => {
    const noValue = answers().map(a => (a.itemKey === 'canopy-exit' ? { ...a, value: null } : a))
    expect(missingItems(electricMotorcycle, noValue).map(i => i.key)).toEqual(['canopy-exit'])
    const undefinedValue = answers().map(a => (a.itemKey === 'canopy-exit' ? { ...a, value: undefined } : a))
    expect(missingItems(electricMotorcycle, undefinedValue).map(i => i.key)).toEqual(['canopy-exit'])
    const na = answers().map(a => (a.itemKey === 'canopy-exit' ? { itemKey: a.itemKey, result: 'na' as const, value: null } : a))
    expect(missingItems(electricMotorcycle, na)).toEqual([])
    const c = clears(electricMotorcycle, noValue, true, bus)
    expect(c).toEqual({ cleared: false, why: 'items not answered: Rider exits unaided with the canopy shut' })
  })

  it('lists every failure and every measurement that cannot be judged, by label', () => {
    const bad = answers().map(a => (a.itemKey === 'bonding' ? { ...a, value: 0.2 } : a.itemKey === 'canopy-exit' ? { ...a, value: 31 } : a))
    const m = measuredVerdicts(electricMotorcycle, bad, bus)
    expect(m.failed).toHaveLength(2)
    expect(m.failed[0]).toBe(`${item('bonding').label} (0.2 Ω is not below 0.1 Ω)`)
    expect(m.failed[1]).toBe('Rider exits unaided with the canopy shut (31 s is over the limit of 30 s)')
    expect(m.unjudged).toEqual([])
    // No declared speed: tyres and parachutes cannot be judged (the mass, only recorded, is not asked for).
    expect(measuredVerdicts(electricMotorcycle, answers(), { busVoltageV: 400, busKind: 'dc' }).unjudged)
      .toEqual([item('parachute').label, item('tyres-rated').label])
    // A not-applicable measurement and an answer for no item of the checklist are left out.
    const extra = [...answers().map(a => (a.itemKey === 'bonding' ? { ...a, result: 'na' as const, value: 9 } : a)),
      { itemKey: 'no-such-item', result: 'pass' as const, value: 99 }]
    expect(measuredVerdicts(electricMotorcycle, extra, bus)).toEqual({ failed: [], unjudged: [] })
    const c = clears(electricMotorcycle, bad, true, bus)
    expect(c.cleared).toBe(false)
    expect(c.why).toBe(`failed: ${m.failed.join('; ')}`)
  })

  it('a failed check and a failed measurement are both named, joined by semicolons', () => {
    const bad = answers().map(a => (a.itemKey === 'helmet' ? { ...a, result: 'fail' as const } : a.itemKey === 'canopy-exit' ? { ...a, value: 31 } : a))
    expect(clears(electricMotorcycle, bad, true, bus).why)
      .toBe('failed: Helmet to the current approved standard; Rider exits unaided with the canopy shut (31 s is over the limit of 30 s)')
  })

  it('a combustion machine needs no working voltage; an electric one does, and a declared speed for its tyres', () => {
    const comb = allItems(combustionMotorcycle).map(i => ({ itemKey: i.key, result: 'pass' as const, value: i.kind === 'measure' ? values[i.key] ?? 1 : null }))
    expect(clears(combustionMotorcycle, comb, true, { declaredKmh: 290 })).toEqual({ cleared: true, why: 'signed inspection, every item passed and every measurement within its limit' })
    expect(clears(electricMotorcycle, answers(), true, { busVoltageV: 400, busKind: 'dc' })).toEqual({ cleared: false,
      why: `no working voltage, bus kind or declared top speed to judge: ${item('parachute').label}; ${item('tyres-rated').label}` })
    expect(clears(electricMotorcycle, answers(), true, { busKind: 'dc', declaredKmh: 290 }).cleared).toBe(false)
    expect(clears(electricMotorcycle, answers(), false, bus)).toEqual({ cleared: false, why: 'the inspection is not signed' })
  })

  it('the streamliner\'s cockpit exit is held to 30 s too', () => {
    expect(checkMeasurement(item('cockpit-exit', electricStreamliner), 30, {}).withinLimit).toBe(true)
    expect(checkMeasurement(item('cockpit-exit', electricStreamliner), '30.01', {}).withinLimit).toBe(false)
  })
})

describe('the checklist follows what the machine is', () => {
  // Electric and hybrid machines carry a traction battery: their isolation and bonding are always measured
  // (UN ECE Regulation 100, 5.1.3); a combustion machine needs neither.
  it('refuses a checklist without isolation and bonding for an electric or hybrid machine only', () => {
    expect(checklistMismatch(combustionMotorcycle, 'electric')).toBe('the Combustion motorcycle checklist has no high-voltage items (isolation, bonding); an electric machine is inspected on one that measures isolation and bonding')
    expect(checklistMismatch(combustionMotorcycle, 'hybrid')).toContain('; a hybrid machine is inspected on one')
    expect(checklistMismatch(combustionMotorcycle, 'combustion')).toBeNull()
    expect(checklistMismatch(electricMotorcycle, 'electric')).toBeNull()
    expect(checklistMismatch(electricStreamliner, 'hybrid')).toBeNull()
  })
})

describe('not applicable by what the machine is', () => {
  // Club rules (from memory): parachutes on streamlined machines; an unstreamlined motorcycle carries none. The canopy
  // exit applies only where there is a canopy (any division may lack one); tyres always apply.
  it('a parachute only on an unstreamlined machine as seen; the canopy on any; tyres never', () => {
    expect(notApplicableRefusal(item('parachute'), 'none')).toBeNull()
    expect(notApplicableRefusal(item('parachute'), 'partial')).toBe('is not applicable only where the machine is unstreamlined; this one is partially streamlined')
    expect(notApplicableRefusal(item('parachute'), 'full')).toBe('is not applicable only where the machine is unstreamlined; this one is fully streamlined')
    expect(notApplicableRefusal(item('parachute'), null)).toBe('is not applicable only where the machine is unstreamlined: confirm the division seen first')
    expect(notApplicableRefusal(item('canopy-exit'), 'full')).toBeNull()
    expect(notApplicableRefusal(item('canopy-exit'), null)).toBeNull()
    expect(notApplicableRefusal(item('tyres-rated'), 'none')).toBe('this item cannot be marked not applicable')
    // An item a profile lets go on two divisions names both.
    const two = { ...item('parachute'), notApplicableOn: ['none', 'partial'] as ('none' | 'partial')[] }
    expect(notApplicableRefusal(two, 'full'))
      .toBe('is not applicable only where the machine is unstreamlined or partially streamlined; this one is fully streamlined')
  })
  it('lists at signing the items marked not applicable that the division seen no longer allows', () => {
    const answers = [
      { itemKey: 'parachute', result: 'na' as const, value: null },
      { itemKey: 'canopy-exit', result: 'na' as const, value: null },
      { itemKey: 'tyres-rated', result: 'pass' as const, value: '300' },
    ]
    expect(notApplicableMisused(electricMotorcycle, answers, 'none')).toEqual([])
    expect(notApplicableMisused(electricMotorcycle, answers, 'full')).toEqual([
      'Parachutes fitted and packed: how many is not applicable only where the machine is unstreamlined; this one is fully streamlined',
    ])
    expect(notApplicableMisused(electricMotorcycle, [{ itemKey: 'gone', result: 'na' as const, value: null }], 'full')).toEqual([])
  })
})
