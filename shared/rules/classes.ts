import type { PowerSource } from '../constants'
import type { Certainty, RuleProfile, Sourced } from './profile'
import { cmp, div, fromDecimal, fromInput, mul, q, toFixed, type Q } from './exact'

/** The streamlining division of a motorcycle (FIM extract: none, partial, full). */
export type Division = 'none' | 'partial' | 'full'

/**
 * A record class: what a machine in it may be. Ranges are exclusive below and inclusive above (over
 * 750 cm³ up to 1000 cm³), as the published class tables read.
 */
export interface RecordClass {
  label: string
  /** No library profile has a hybrid class (none known from the rulebooks); an organiser may add one, sourced. */
  propulsion: PowerSource
  /** Motorcycles: the streamlining division; absent where the class does not go by it. */
  division?: Division
  capacityCm3?: { over: number, upTo: number | null }
  massKg?: { over: number, upTo: number | null }
  certainty: Certainty
}

export const DIVISION_WORDS: Record<Division, string> = {
  none: 'unstreamlined',
  partial: 'partially streamlined',
  full: 'fully streamlined',
}

/**
 * Combustion capacity steps for solo motorcycles, cm³ (from memory of the international rulebook's
 * capacity classes: confirm against the rulebook in force).
 */
export const MOTORCYCLE_CAPACITY_STEPS = [50, 125, 250, 350, 500, 750, 1000, 1350, 3000]

/** The international motorcycle classes: electric by division, combustion by capacity and division. */
export function motorcycleClasses(): RecordClass[] {
  const divisions: Division[] = ['none', 'partial', 'full']
  const electric = divisions.map(d => ({
    label: `Electric, ${DIVISION_WORDS[d]}`,
    propulsion: 'electric' as const,
    division: d,
    certainty: 'seen' as const,
  }))
  const over = (i: number) => (i ? MOTORCYCLE_CAPACITY_STEPS[i - 1]! : 0)
  const combustion = divisions.flatMap(d => MOTORCYCLE_CAPACITY_STEPS.map((upTo, i) => ({
    label: `Combustion, ${i ? `over ${over(i)} cm³ ` : ''}up to ${upTo} cm³, ${DIVISION_WORDS[d]}`,
    propulsion: 'combustion' as const,
    division: d,
    capacityCm3: { over: over(i), upTo },
    certainty: 'from memory' as const,
  })))
  return [...electric, ...combustion]
}

/** The classes a profile lists (a frozen copy from before classes were data has none). */
export const classesOf = (p: Pick<RuleProfile, 'classes'>): RecordClass[] => p.classes?.value ?? []

/**
 * Why a machine of this propulsion cannot enter the class, or null when it can: the class is for one propulsion.
 * Said at entry, so that a machine no class takes (a hybrid, where the list has no hybrid class) is refused there
 * rather than found outside its class after its runs.
 */
export function propulsionRefusal(c: RecordClass, power: PowerSource, classes: RecordClass[]): string | null {
  if (c.propulsion === power) return null
  const any = classes.some(x => x.propulsion === power)
  return `is a class for ${c.propulsion} machines; the machine is ${power}`
    + (any
      ? ''
      : `, and no class of this event takes a ${power} machine `
        + '(the organiser can add one, with its rulebook)')
}

/** The class of a label, compared as people write it: case and spacing aside. */
export function findClass(classes: RecordClass[], label: string) {
  const norm = (s: string) => s.trim().replace(/\s+/g, ' ').toLowerCase()
  return classes.find(c => norm(c.label) === norm(label)) ?? null
}

export interface MachineFacts {
  power: PowerSource
  division: Division | null
  /** As measured at the inspection in force, exact decimals; null when not measured. */
  massKg: string | null
  capacityCm3: string | null
}

const within = (value: Q, range: { over: number, upTo: number | null }) =>
  cmp(value, fromInput(range.over)) > 0 && (range.upTo === null || cmp(value, fromInput(range.upTo)) <= 0)
const rangeWords = (r: { over: number, upTo: number | null }, unit: string) =>
  r.upTo === null ? `over ${r.over} ${unit}` : `${r.over ? `over ${r.over} ${unit}, ` : ''}up to ${r.upTo} ${unit}`

/**
 * Whether a machine fits its class, with the figures side by side for each limit it does not meet; a
 * limit whose figure was not measured is named too (it cannot be judged).
 */
export function classProblems(c: RecordClass, m: MachineFacts): string[] {
  const out: string[] = []
  if (c.propulsion !== m.power) out.push(`propulsion: the class is ${c.propulsion}, the machine ${m.power}`)
  if (c.division && m.division && c.division !== m.division)
    out.push(`division: the class is ${DIVISION_WORDS[c.division]}, the machine ${DIVISION_WORDS[m.division]}`)
  return [...out, ...figureProblems(c, m)]
}

/**
 * The measured figures against the class's limits alone (capacity, mass): each limit not met, or not measured,
 * with the figures side by side. The post-run check re-judges the class on its own figures with this.
 */
export function figureProblems(c: RecordClass, m: Pick<MachineFacts, 'massKg' | 'capacityCm3'>): string[] {
  const out: string[] = []
  const limits = [['capacity', 'cm³', c.capacityCm3, m.capacityCm3], ['mass', 'kg', c.massKg, m.massKg]] as const
  for (const [what, unit, range, figure] of limits) {
    if (!range) continue
    if (figure === null) out.push(`${what}: not measured; the class is ${rangeWords(range, unit)}`)
    else if (!within(fromDecimal(figure), range))
      out.push(`${what}: measured ${figure} ${unit}, the class is ${rangeWords(range, unit)}`)
  }
  return out
}

/**
 * π to 40 decimals (a rational close enough that a swept volume in cm³ is exact to far more than the
 * two decimals printed).
 */
const PI = q(31415926535897932384626433832795028841971n, 10n ** 40n)

/**
 * Swept volume of an engine: π/4 × bore² × stroke × cylinders (the geometric volume of the cylinders
 * swept by the pistons; ISO 2710-1 vocabulary "swept volume", formula common practice). Bore and
 * stroke in mm; the answer in cm³, rounded to two decimals.
 */
export function sweptVolumeCm3(boreMm: string | number, strokeMm: string | number, cylinders: number): string {
  const bore = fromInput(boreMm)
  const cubicMm = mul(mul(div(PI, q(4n)), mul(bore, bore)), mul(fromInput(strokeMm), q(BigInt(cylinders))))
  return toFixed(div(cubicMm, q(1000n)), 2, 'round')
}

export type ClassesRule = Sourced<RecordClass[]>
