import type { ChecklistItem, ChecklistTemplate, MeasureUnit } from './template'
import type { BusKind, ItemResult, Streamlining } from '../constants'
import { DIVISION_WORDS } from '../rules/classes'
import {
  cmp, decimalsOf, div, fromDecimal, fromInput, fromNumber, isPositive, mul, q, toExactDecimal, toFixed, type Q,
} from '../rules/exact'
import { mphToKmh } from '../rules/units'

export type { ItemResult }

export interface Answer {
  itemKey: string
  result: ItemResult
  /** A measurement in the item's unit, as the exact decimal stored (or a number, in tests). */
  value?: string | number | null
  note?: string | null
}

/** What an inspection judges some measurements against: the working voltage and the declared speed. */
export interface Figures {
  busVoltageV?: number | string | null
  busKind?: BusKind | null
  /** The top speed the team declares the machine may reach, km/h. */
  declaredKmh?: number | string | null
}

/**
 * Units a measurement may be typed in, with the exact factor to the item's unit as a decimal: the pound
 * is 0.45359237 kg and the mile 1.609344 km exactly (international yard and pound agreement of 1959;
 * NIST SP 811, appendix B); the cubic inch is 2.54³ = 16.387064 cm³ exactly.
 */
export const UNIT_FACTORS: Record<MeasureUnit, Record<string, string>> = {
  'Ω': { Ω: '1', kΩ: '1000', MΩ: '1000000', mΩ: '0.001' },
  'kg': { kg: '1', lb: '0.45359237' },
  's': { s: '1' },
  'km/h': { 'km/h': '1', 'mph': '1.609344' },
  'count': { count: '1' },
  'cm³': { 'cm³': '1', 'L': '1000', 'in³': '16.387064' },
}

/** Decimal places kept for a value typed in, and for the value stored in the item's unit. */
export const TYPED_DECIMALS = 6
export const STORED_DECIMALS = 15

/**
 * A typed measurement in the item's unit, exactly, as a decimal string: no float on the way, so 250 lb
 * is stored as 113.3980925 kg and 2.4 MΩ as 2400000 Ω.
 */
export function toItemUnit(item: ChecklistItem, value: number | string, unit: string): string {
  const factors = UNIT_FACTORS[item.unit ?? 'count'] ?? {}
  const factor = factors[unit]
  if (factor === undefined) throw new RangeError(`must be in ${Object.keys(factors).join(', ')}`)
  let typed
  try {
    typed = fromInput(value)
  }
  catch {
    throw new RangeError('must be a decimal number')
  }
  if (typed.n < 0n) throw new RangeError('must not be negative')
  if (decimalsOf(value) > TYPED_DECIMALS) throw new RangeError(`must have at most ${TYPED_DECIMALS} decimals`)
  if (item.unit === 'count' && typed.d !== 1n) throw new RangeError('must be a whole number')
  const exact = toExactDecimal(mul(typed, fromDecimal(factor)), STORED_DECIMALS)
  if (exact === null) throw new RangeError(`must convert to ${item.unit} within ${STORED_DECIMALS} decimals`)
  return exact
}

export interface ItemVerdict {
  /** What the measurement says, whatever result the scrutineer chose; null when it cannot be judged. */
  withinLimit: boolean | null
  message: string | null
}

/** Words for each bus kind, as the report prints them. */
export const BUS_WORDS: Record<BusKind, string> = {
  'dc': 'DC',
  'ac': 'AC',
  'dc-ac': 'DC and AC connected',
  'dc-ac-protected': 'DC and AC connected, AC side with the additional protection',
}

/**
 * The isolation needed per volt of the maximum working voltage (UN ECE Regulation 100, 5.1.3): 100 Ω/V
 * on a DC bus, 500 Ω/V on an AC bus; DC and AC buses conductively connected need 500 Ω/V, unless the
 * AC side has the additional protection the paragraph names, then 100 Ω/V (connected buses: from
 * memory, confirm the wording in the regulation in force).
 */
export function isolationNeeded(limit: { dc: number, ac: number }, kind: BusKind): number {
  return kind === 'dc' || kind === 'dc-ac-protected' ? limit.dc : limit.ac
}

/** The count a `count-for-speed` limit needs at a declared speed (km/h): the highest step passed. */
export function countNeeded(steps: { overMph: number, count: number }[], declaredKmh: Q): number {
  return steps
    .filter(s => cmp(declaredKmh, mphToKmh(fromNumber(s.overMph))) > 0)
    .reduce((n, s) => Math.max(n, s.count), 0)
}

const asQ = (x: number | string | null | undefined): Q | null =>
  x === null || x === undefined || x === '' ? null : fromInput(x)
const words = (x: Q) => toExactDecimal(x, STORED_DECIMALS) ?? toFixed(x, 3, 'round')
const pass = (message: string | null = null): ItemVerdict => ({ withinLimit: true, message })
const fail = (message: string): ItemVerdict => ({ withinLimit: false, message })
const unjudged = (message: string | null): ItemVerdict => ({ withinLimit: null, message })

/**
 * Checks a measurement against its limit, exactly. Isolation: measured resistance ÷ working voltage
 * against the value per volt for the bus (see `isolationNeeded`); a tyre's rated speed and the number
 * of parachutes against the declared speed.
 */
export function checkMeasurement(
  item: ChecklistItem,
  value: number | string | null | undefined,
  figures: Figures,
): ItemVerdict {
  const v = asQ(value)
  if (item.kind !== 'measure' || v === null || !item.limit) return unjudged(null)
  const l = item.limit
  const unit = item.unit === 'count' ? '' : ` ${item.unit}`
  const shown = `${words(v)}${unit}`
  switch (l.kind) {
    case 'max':
      return cmp(v, fromNumber(l.value)) <= 0 ? pass() : fail(`${shown} is over the limit of ${l.value}${unit}`)
    case 'below':
      return cmp(v, fromNumber(l.value)) < 0 ? pass() : fail(`${shown} is not below ${l.value}${unit}`)
    case 'min':
      return cmp(v, fromNumber(l.value)) >= 0 ? pass() : fail(`${shown} is under the minimum of ${l.value}${unit}`)
    case 'recorded':
      return unjudged(`${shown} recorded`)
    case 'declared-speed': {
      const declared = asQ(figures.declaredKmh)
      if (!declared) return unjudged('enter the declared top speed to check the tyres against it')
      const text = `rated ${shown}, declared top speed ${words(declared)} km/h`
      return cmp(v, declared) >= 0 ? pass(text) : fail(`${text}: rated under the declared speed`)
    }
    case 'count-for-speed': {
      const declared = asQ(figures.declaredKmh)
      if (!declared) return unjudged('enter the declared top speed to check the count needed')
      const needed = countNeeded(l.steps, declared)
      const text = `${shown} fitted, ${needed} needed at ${words(declared)} km/h`
      return cmp(v, q(BigInt(needed))) >= 0 ? pass(text) : fail(`${text}: too few`)
    }
    case 'isolation-per-volt': {
      const volts = asQ(figures.busVoltageV)
      if (!volts || !isPositive(volts) || !figures.busKind)
        return unjudged('enter the working voltage and whether the bus is DC or AC to check the isolation')
      const perVolt = div(v, volts)
      const needed = isolationNeeded(l, figures.busKind)
      const text = `${toFixed(perVolt, 1)} Ω/V at ${words(volts)} V ${BUS_WORDS[figures.busKind]}`
      return cmp(perVolt, q(BigInt(needed))) >= 0
        ? pass(`${text}, at least ${needed} Ω/V needed`)
        : fail(`${text} is under the ${needed} Ω/V needed`)
    }
  }
}

export const allItems = (t: ChecklistTemplate) => t.sections.flatMap(s => s.items)

/** What stops an inspection from being signed: unanswered items, and measurements without a value. */
export function missingItems(t: ChecklistTemplate, answers: Answer[]): ChecklistItem[] {
  const byKey = new Map(answers.map(a => [a.itemKey, a]))
  return allItems(t).filter((i) => {
    const a = byKey.get(i.key)
    if (!a) return true
    return i.kind === 'measure' && a.result !== 'na' && (a.value === null || a.value === undefined)
  })
}

/**
 * What the measurements say, item by item: a value outside its limit fails whatever was ticked, and
 * an isolation value cannot be judged without the bus's working voltage and kind.
 */
export function measuredVerdicts(t: ChecklistTemplate, answers: Answer[], figures: Figures) {
  const items = new Map(allItems(t).map(i => [i.key, i]))
  const failed: string[] = []
  const unjudged: string[] = []
  for (const a of answers) {
    const item = items.get(a.itemKey)
    if (!item || item.kind !== 'measure' || a.result === 'na') continue
    const v = checkMeasurement(item, a.value, figures)
    if (v.withinLimit === false) failed.push(`${item.label} (${v.message})`)
    if (v.withinLimit === null && item.limit && item.limit.kind !== 'recorded') unjudged.push(item.label)
  }
  return { failed, unjudged }
}

/**
 * An entry is cleared only by a signed inspection with every item passed or not applicable, and every
 * measurement within its limit: the measured value decides, whatever was ticked.
 */
export function clears(
  t: ChecklistTemplate,
  answers: Answer[],
  signed: boolean,
  figures: Figures = {},
): { cleared: boolean, why: string } {
  if (!signed) return { cleared: false, why: 'the inspection is not signed' }
  const missing = missingItems(t, answers)
  if (missing.length) return { cleared: false, why: `items not answered: ${missing.map(i => i.label).join('; ')}` }
  if (t.power === 'electric' && (!asQ(figures.busVoltageV) || !figures.busKind))
    return { cleared: false, why: 'no working voltage and bus kind: an electric machine needs them to be cleared' }
  const measured = measuredVerdicts(t, answers, figures)
  const label = new Map(allItems(t).map(i => [i.key, i.label]))
  const failed = [
    ...answers.filter(a => a.result === 'fail').map(a => label.get(a.itemKey) ?? a.itemKey),
    ...measured.failed,
  ]
  if (failed.length) return { cleared: false, why: `failed: ${failed.join('; ')}` }
  if (measured.unjudged.length) {
    return {
      cleared: false,
      why: `no working voltage, bus kind or declared top speed to judge: ${measured.unjudged.join('; ')}`,
    }
  }
  return { cleared: true, why: 'signed inspection, every item passed and every measurement within its limit' }
}

/**
 * Why an item cannot be marked not applicable on this machine, or null when it can: only items that allow it, and an
 * item not applicable only on some streamlining divisions only on those, as the scrutineer saw the machine.
 */
export function notApplicableRefusal(item: ChecklistItem, division: Streamlining | null): string | null {
  if (!item.allowNotApplicable) return 'this item cannot be marked not applicable'
  const on = item.notApplicableOn
  if (!on) return null
  const machines = on.map(d => DIVISION_WORDS[d]).join(' or ')
  const only = `is not applicable only where the machine is ${machines}`
  if (division === null) return `${only}: confirm the division seen first`
  if (!on.includes(division)) return `${only}; this one is ${DIVISION_WORDS[division]}`
  return null
}

/** The items marked not applicable that may not be on this machine (the division seen changed since), by label. */
export function notApplicableMisused(t: ChecklistTemplate, answers: Answer[], division: Streamlining | null): string[] {
  const items = new Map(allItems(t).map(i => [i.key, i]))
  return answers.filter(a => a.result === 'na').flatMap((a) => {
    const item = items.get(a.itemKey)
    const why = item ? notApplicableRefusal(item, division) : null
    return why ? [`${item!.label} ${why}`] : []
  })
}

/** The high-voltage items an electric or hybrid machine is always inspected on (UN ECE Regulation 100, 5.1.3). */
export const HIGH_VOLTAGE_KEYS = ['isolation', 'bonding'] as const

/**
 * Why this checklist cannot inspect a machine of this power, or null when it can: an electric or hybrid machine is
 * always inspected on a checklist with the high-voltage items (isolation and bonding measured), whatever was chosen.
 */
export function checklistMismatch(checklist: ChecklistTemplate, power: string): string | null {
  if (power !== 'electric' && power !== 'hybrid') return null
  const keys = new Set(allItems(checklist).map(i => i.key))
  const missing = HIGH_VOLTAGE_KEYS.filter(k => !keys.has(k))
  if (!missing.length) return null
  const machine = power === 'electric' ? 'an electric' : 'a hybrid'
  return `the ${checklist.name} checklist has no high-voltage items (${missing.join(', ')}); `
    + `${machine} machine is inspected on one that measures isolation and bonding`
}
