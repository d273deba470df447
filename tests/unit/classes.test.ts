import { beforeEach, describe, expect, it } from 'vitest'
import { classesOf, classProblems, figureProblems, findClass, motorcycleClasses, propulsionRefusal, sweptVolumeCm3 } from '#shared/rules/classes'
import { profiles } from '#shared/rules/profiles'

describe('swept volume', () => {
  // The geometric formula V = π/4 · bore² · stroke · cylinders (common practice of capacity checks;
  // ISO 2710-1 calls it swept volume). A 100 mm × 100 mm single is π/4 · 10³ cm³ = 785.398… cm³.
  it('computes the capacity from bore, stroke and cylinders', () => {
    expect(sweptVolumeCm3(100, 100, 1)).toBe('785.40')
    // Checked against the same formula with JavaScript's Math.PI (a reference independent of our rationals):
    // 74 mm × 58 mm × 4 cylinders = 997.79 cm³.
    expect(sweptVolumeCm3('74', '58', 4)).toBe((Math.PI / 4 * 74 ** 2 * 58 * 4 / 1000).toFixed(2))
    expect(sweptVolumeCm3('74.0', '58.0', 4)).toBe('997.79')
  })
})

describe('eligibility against the class', () => {
  // Found in each test, never while the tests are collected: a mutant is switched on only inside a test.
  let classes: ReturnType<typeof motorcycleClasses>
  let litre: NonNullable<ReturnType<typeof findClass>>
  beforeEach(() => {
    classes = motorcycleClasses()
    litre = findClass(classes, 'Combustion, over 750 cm³ up to 1000 cm³, fully streamlined')!
  })
  const machine = { power: 'combustion' as const, division: 'full' as const, massKg: '210.5', capacityCm3: '998' }
  it('a machine within the capacity range fits; the upper limit is inclusive, the lower exclusive', () => {
    expect(classProblems(litre, machine)).toEqual([])
    expect(classProblems(litre, { ...machine, capacityCm3: '1000' })).toEqual([])
    expect(classProblems(litre, { ...machine, capacityCm3: '750' })).toEqual([
      'capacity: measured 750 cm³, the class is over 750 cm³, up to 1000 cm³',
    ])
  })

  it('names each limit not met with the figures side by side, and a figure not measured', () => {
    expect(classProblems(litre, { power: 'electric', division: 'partial', massKg: null, capacityCm3: '1000.5' })).toEqual([
      'propulsion: the class is combustion, the machine electric',
      'division: the class is fully streamlined, the machine partially streamlined',
      'capacity: measured 1000.5 cm³, the class is over 750 cm³, up to 1000 cm³',
    ])
    expect(classProblems(litre, { ...machine, capacityCm3: null })).toEqual([
      'capacity: not measured; the class is over 750 cm³, up to 1000 cm³',
    ])
  })

  it('re-judges the figures alone after a run: propulsion and division are the entry\'s, not measured again', () => {
    // The post-run check measures capacity and mass; the class's range is read as above (inclusive above).
    expect(figureProblems(litre, { massKg: '210.5', capacityCm3: '1000' })).toEqual([])
    expect(figureProblems(litre, { massKg: '210.5', capacityCm3: '1000.01' })).toEqual([
      'capacity: measured 1000.01 cm³, the class is over 750 cm³, up to 1000 cm³',
    ])
    expect(figureProblems(litre, { massKg: null, capacityCm3: null })).toEqual([
      'capacity: not measured; the class is over 750 cm³, up to 1000 cm³',
    ])
    const electric = findClass(classes, 'Electric, fully streamlined')!
    expect(figureProblems(electric, { massKg: null, capacityCm3: '5000' })).toEqual([]) // no limit, nothing to say
  })

  it('refuses at entry a propulsion the class is not for, saying when no class takes it at all', () => {
    const electric = findClass(classes, 'Electric, fully streamlined')!
    expect(propulsionRefusal(electric, 'electric', classes)).toBeNull()
    expect(propulsionRefusal(electric, 'combustion', classes)).toBe('is a class for electric machines; the machine is combustion')
    // No library profile has a hybrid class: the refusal says no class takes one.
    expect(propulsionRefusal(electric, 'hybrid', classes)).toBe('is a class for electric machines; the machine is hybrid, '
      + 'and no class of this event takes a hybrid machine (the organiser can add one, with its rulebook)')
    const withHybrid = [...classes, { label: 'Hybrid', propulsion: 'hybrid' as const, certainty: 'seen' as const }]
    expect(propulsionRefusal(electric, 'hybrid', withHybrid)).toBe('is a class for electric machines; the machine is hybrid')
  })

  it('finds a class as people write it, case and spacing aside; every library profile lists classes', () => {
    expect(findClass(classes, '  electric,  FULLY streamlined ')?.label).toBe('Electric, fully streamlined')
    expect(findClass(classes, 'Electric, open')).toBeNull()
    for (const p of Object.values(profiles)) {
      expect(p.classes?.value.length, p.id).toBeGreaterThan(0)
      const labels = p.classes!.value.map(c => c.label.toLowerCase())
      expect(new Set(labels).size, p.id).toBe(labels.length)
    }
  })
})

describe('classes by mass and division, at their edges', () => {
  // The automobile profile's electric classes by mass (FIA Appendix D categories, from memory): up to 500 kg,
  // over 500 up to 1000 kg, over 1000 kg. A limit "up to" includes it, "over" excludes it.
  const auto = profiles['intl-automobile'].classes!.value
  const car = { power: 'electric' as const, division: null, capacityCm3: null }
  it('holds a mass at the upper limit in its class and a gram over it out, saying both', () => {
    const light = findClass(auto, 'Electric automobile, up to 500 kg')!
    expect(classProblems(light, { ...car, massKg: '500' })).toEqual([])
    expect(classProblems(light, { ...car, massKg: '500.001' })).toEqual(['mass: measured 500.001 kg, the class is up to 500 kg'])
    const middle = findClass(auto, 'electric automobile,   over 500 kg up to 1000 kg')!
    expect(classProblems(middle, { ...car, massKg: '500' })).toEqual(['mass: measured 500 kg, the class is over 500 kg, up to 1000 kg'])
    const heavy = findClass(auto, 'Electric automobile, over 1000 kg')!
    expect(classProblems(heavy, { ...car, massKg: '1000' })).toEqual(['mass: measured 1000 kg, the class is over 1000 kg'])
    expect(classProblems(heavy, { ...car, massKg: null })).toEqual(['mass: not measured; the class is over 1000 kg'])
    expect(classProblems(heavy, { ...car, massKg: '1000.001' })).toEqual([])
  })
  it('names a division that differs, and not one that is unknown on either side', () => {
    const partial = findClass(motorcycleClasses(), 'Electric, partially streamlined')!
    const m = { power: 'electric' as const, massKg: null, capacityCm3: null }
    expect(classProblems(partial, { ...m, division: 'full' })).toEqual(['division: the class is partially streamlined, the machine fully streamlined'])
    expect(classProblems(partial, { ...m, division: null })).toEqual([])
    expect(classProblems({ ...partial, division: undefined }, { ...m, division: 'full' })).toEqual([])
    expect(classProblems(partial, { ...m, power: 'combustion', division: 'partial' })).toEqual(['propulsion: the class is electric, the machine combustion'])
  })
  it('lists no classes for a profile copy frozen before classes were data', () => {
    expect(classesOf({})).toEqual([])
    expect(findClass(auto, 'No such class')).toBeNull()
  })
})
