import type { Streamlining } from '../constants'
import type { Certainty } from '../rules/profile'

export type ItemKind = 'check' | 'measure'

/** What a measurement is checked against. */
export type ItemLimit
  = | { kind: 'max', value: number }
  /** Strictly under the value: the value itself fails (a standard that says "below"). */
    | { kind: 'below', value: number }
    | { kind: 'min', value: number }
  /** Isolation resistance per volt of the bus: at least dc Ω/V on a DC bus, ac Ω/V on an AC bus. */
    | { kind: 'isolation-per-volt', dc: number, ac: number }
  /** At least the speed the team declares the machine may reach (a tyre's rated speed). */
    | { kind: 'declared-speed' }
  /** A count that grows with the declared speed: `count` needed above `overMph` (parachutes). */
    | { kind: 'count-for-speed', steps: { overMph: number, count: number }[] }
  /** Recorded for a later comparison (the class's limits, a post-run re-measure), with no limit here. */
    | { kind: 'recorded' }

export type MeasureUnit = 'Ω' | 'kg' | 's' | 'km/h' | 'count' | 'cm³'

export interface ChecklistItem {
  key: string
  label: string
  kind: ItemKind
  /** Unit of a measurement as stored; entries in other units of the same quantity are converted. */
  unit?: MeasureUnit
  limit?: ItemLimit
  /** Items that may be marked not applicable (e.g. canopy exit on an unstreamlined machine), with a reason. */
  allowNotApplicable?: boolean
  /**
   * Where the item is not applicable only on some machines: the streamlining divisions (as the scrutineer sees them)
   * on which it may be marked so; on any other it is answered.
   */
  notApplicableOn?: Streamlining[]
  /** A safety item: an organiser's adapted copy keeps it. */
  safety?: boolean
  source: string
  certainty: Certainty
}

export interface ChecklistSection {
  title: string
  items: ChecklistItem[]
}

export interface ChecklistTemplate {
  id: string
  version: number
  name: string
  power: 'electric' | 'combustion'
  sections: ChecklistSection[]
  /**
   * Safety items an organiser's copy leaves out, each with the rulebook article that allows it; such a
   * copy is used only once a scrutineer has signed it.
   */
  removedSafetyItems?: { key: string, label: string, reference: string }[]
}

export const CHECKLIST_CAUTION
  = 'This checklist is a template. The applicable rulebook, the chief scrutineer and qualified high-voltage practice '
    + 'decide; Trapline records the inspection, it does not certify safety.'
