import { describe, expect, it } from 'vitest'
import { classProblems, findClass, motorcycleClasses, sweptVolumeCm3 } from '#shared/rules/classes'
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
  const classes = motorcycleClasses()
  const litre = findClass(classes, 'Combustion, over 750 cm³ up to 1000 cm³, fully streamlined')!
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
