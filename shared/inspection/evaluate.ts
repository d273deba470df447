import type { ChecklistItem, ChecklistTemplate } from './template'
import type { BusKind, ItemResult } from '../constants'

export type { ItemResult }

export interface Answer {
  itemKey: string
  result: ItemResult
  /** A measurement, in the item's unit after conversion. */
  value?: number | null
  note?: string | null
}

export interface BusContext {
  busVoltageV?: number | null
  busKind?: BusKind | null
}

/** Units a measurement may be typed in, with the factor to the item's unit. */
export const UNIT_FACTORS: Record<string, Record<string, number>> = {
  Ω: { Ω: 1, kΩ: 1e3, MΩ: 1e6, mΩ: 1e-3 },
  kg: { kg: 1 },
  s: { s: 1 },
}

export function toItemUnit(item: ChecklistItem, value: number, unit: string): number {
  const factor = UNIT_FACTORS[item.unit ?? '']?.[unit]
  if (factor === undefined)
    throw new RangeError(`must be in ${Object.keys(UNIT_FACTORS[item.unit ?? ''] ?? {}).join(', ')}`)
  return value * factor
}

export interface ItemVerdict {
  /** What the measurement says, whatever result the scrutineer chose. */
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

/**
 * Checks a measurement against its limit. Isolation: measured resistance ÷ bus voltage against the
 * value per volt for the bus (see `isolationNeeded`).
 */
export function checkMeasurement(
  item: ChecklistItem,
  value: number | null | undefined,
  bus: BusContext,
): ItemVerdict {
  if (item.kind !== 'measure' || value === null || value === undefined || !item.limit)
    return { withinLimit: null, message: null }
  const l = item.limit
  if (l.kind === 'max')
    return value <= l.value
      ? { withinLimit: true, message: null }
      : { withinLimit: false, message: `${value} ${item.unit} is over the limit of ${l.value} ${item.unit}` }
  if (l.kind === 'min')
    return value >= l.value
      ? { withinLimit: true, message: null }
      : { withinLimit: false, message: `${value} ${item.unit} is under the minimum of ${l.value} ${item.unit}` }
  if (!bus.busVoltageV || !bus.busKind)
    return { withinLimit: null, message: 'enter the bus voltage and whether it is DC or AC to check the isolation' }
  const perVolt = value / bus.busVoltageV
  const needed = isolationNeeded(l, bus.busKind)
  const text = `${perVolt.toFixed(1)} Ω/V at ${bus.busVoltageV} V ${BUS_WORDS[bus.busKind]}`
  return perVolt >= needed
    ? { withinLimit: true, message: `${text}, at least ${needed} Ω/V needed` }
    : { withinLimit: false, message: `${text} is under the ${needed} Ω/V needed` }
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
export function measuredVerdicts(t: ChecklistTemplate, answers: Answer[], bus: BusContext) {
  const items = new Map(allItems(t).map(i => [i.key, i]))
  const failed: string[] = []
  const unjudged: string[] = []
  for (const a of answers) {
    const item = items.get(a.itemKey)
    if (!item || item.kind !== 'measure' || a.result === 'na') continue
    const v = checkMeasurement(item, a.value, bus)
    if (v.withinLimit === false) failed.push(`${item.label} (${v.message})`)
    if (v.withinLimit === null && item.limit?.kind === 'isolation-per-volt') unjudged.push(item.label)
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
  bus: BusContext = {},
): { cleared: boolean, why: string } {
  if (!signed) return { cleared: false, why: 'the inspection is not signed' }
  const missing = missingItems(t, answers)
  if (missing.length) return { cleared: false, why: `items not answered: ${missing.map(i => i.label).join('; ')}` }
  const measured = measuredVerdicts(t, answers, bus)
  if (measured.unjudged.length) {
    return {
      cleared: false,
      why: `no working voltage and bus kind to judge: ${measured.unjudged.join('; ')}`,
    }
  }
  const label = new Map(allItems(t).map(i => [i.key, i.label]))
  const failed = [
    ...answers.filter(a => a.result === 'fail').map(a => label.get(a.itemKey) ?? a.itemKey),
    ...measured.failed,
  ]
  if (failed.length) return { cleared: false, why: `failed: ${failed.join('; ')}` }
  return { cleared: true, why: 'signed inspection, every item passed and every measurement within its limit' }
}
