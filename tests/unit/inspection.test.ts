import { describe, expect, it } from 'vitest'
import { checkMeasurement, clears, missingItems, toItemUnit, allItems } from '#shared/inspection/evaluate'
import { electricMotorcycle } from '#shared/inspection/templates'

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
    expect(low.message).toBe('434.8 Ω/V at 230 V AC is under the 500 Ω/V needed')
  })

  it('cannot judge without the bus voltage', () => {
    expect(checkMeasurement(item('isolation'), 1e6, {}).withinLimit).toBeNull()
  })
})

describe('measurements', () => {
  it('converts kΩ and MΩ and refuses other units', () => {
    expect(toItemUnit(item('isolation'), 2.4, 'MΩ')).toBe(2_400_000)
    expect(toItemUnit(item('bonding'), 30, 'mΩ')).toBeCloseTo(0.03, 12)
    expect(() => toItemUnit(item('isolation'), 400, 'V')).toThrow(/must be in Ω, kΩ, MΩ, mΩ/)
  })

  it('bonding of exposed conductive parts below 0.1 Ω (published safety-standard extracts)', () => {
    expect(checkMeasurement(item('bonding'), 0.1, {}).withinLimit).toBe(true)
    expect(checkMeasurement(item('bonding'), 0.11, {}).withinLimit).toBe(false)
  })
})

describe('clearance', () => {
  const all = allItems(electricMotorcycle).map(i => ({ itemKey: i.key, result: 'pass' as const, value: i.kind === 'measure' ? 1e6 : null }))
  it('needs a signature, every item answered and none failed', () => {
    expect(clears(electricMotorcycle, all, false).cleared).toBe(false)
    expect(clears(electricMotorcycle, all, true)).toEqual({ cleared: true, why: 'signed inspection, no failed item' })
    const failed = all.map(a => (a.itemKey === 'helmet' ? { ...a, result: 'fail' as const } : a))
    expect(clears(electricMotorcycle, failed, true).why).toBe('failed: Helmet to the current approved standard')
    expect(missingItems(electricMotorcycle, all.slice(1)).map(i => i.key)).toEqual(['cutoff-lanyard'])
  })
})
