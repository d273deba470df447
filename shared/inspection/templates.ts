import type { ChecklistItem, ChecklistSection, ChecklistTemplate } from './template'

const SEEN = { source: 'published rulebook and safety-standard extracts', certainty: 'seen' as const }
const PRACTICE = { source: 'common practice of record scrutineering', certainty: 'common practice' as const }

/** Parachutes needed by declared speed (from memory of club rules: see the item's source). */
/** The canopy exit time: the rulebooks set one; 30 s is the value reported, to confirm in the rulebook in force. */
const CANOPY_EXIT_SOURCE = 'streamliner rules set a time within which the rider leaves unaided with the canopy shut; '
  + '30 s as reported, to confirm in the rulebook in force'

export const PARACHUTE_STEPS = [{ overMph: 175, count: 1 }, { overMph: 300, count: 2 }]

const riderControls: ChecklistSection = {
  title: 'Rider controls',
  items: [
    {
      key: 'cutoff-lanyard',
      safety: true,
      label:
        'Emergency cut-off on the handlebar, tethered to the rider by a non-elastic lanyard, breaks the power supply',
      kind: 'check',
      ...SEEN,
    },
    {
      key: 'cutoff-reach',
      label: 'Cut-off reachable without letting go of the bars',
      kind: 'check',
      safety: true,
      ...SEEN,
    },
  ],
}

const highVoltage: ChecklistSection = {
  title: 'High-voltage system',
  items: [
    {
      key: 'live-dash-light',
      safety: true,
      label: '"Live" indicator light on the dashboard, flashing when the system is live',
      kind: 'check',
      ...SEEN,
    },
    {
      key: 'live-rear-light',
      safety: true,
      label: '"Live" indicator light at the rear, flashing when the system is live',
      kind: 'check',
      ...SEEN,
    },
    { key: 'hv-cables-orange', label: 'High-voltage cables in orange covering', kind: 'check', safety: true, ...SEEN },
    {
      key: 'hv-warning-labels',
      label: 'High-voltage warning symbol on every enclosure of live parts',
      kind: 'check',
      safety: true,
      source: 'UN ECE Regulation 100, marking of high-voltage parts (from memory: confirm the paragraph)',
      certainty: 'from memory',
    },
    {
      key: 'hv-service-disconnect',
      label: 'High-voltage service disconnect fitted, marked and reachable by the marshals',
      kind: 'check',
      safety: true,
      ...PRACTICE,
    },
    {
      key: 'isolation-monitoring',
      label: 'Isolation monitoring fitted and working (warns the rider of a fault)',
      kind: 'check',
      allowNotApplicable: true,
      safety: true,
      ...PRACTICE,
    },
    {
      key: 'make-safe-procedure',
      label: 'Written post-crash make-safe procedure, naming the qualified persons who may perform it',
      kind: 'check',
      safety: true,
      ...PRACTICE,
    },
    {
      key: 'isolation',
      safety: true,
      label: 'Isolation resistance of the high-voltage bus',
      kind: 'measure',
      unit: 'Ω',
      limit: { kind: 'isolation-per-volt', dc: 100, ac: 500 },
      source: 'UN ECE Regulation 100, 5.1.3: at least 100 Ω per volt for DC and 500 Ω per volt for AC',
      certainty: 'seen',
    },
    {
      key: 'bonding',
      safety: true,
      label: 'Bonding of exposed conductive parts',
      kind: 'measure',
      unit: 'Ω',
      limit: { kind: 'below', value: 0.1 },
      source: 'published safety-standard extracts: below 0.1 Ω (UN ECE Regulation 100, from memory); 0.1 Ω fails',
      certainty: 'seen',
    },
  ],
}

const chassis: ChecklistSection = {
  title: 'Machine',
  items: [
    {
      key: 'chain-guard',
      label: 'Chain guard on any exposed chain',
      kind: 'check',
      allowNotApplicable: true,
      ...SEEN,
    },
    { key: 'stands-removed', label: 'Stands, mirrors and passenger pegs removed', kind: 'check', ...SEEN },
    { key: 'lenses-taped', label: 'Lenses taped', kind: 'check', allowNotApplicable: true, ...SEEN },
    {
      key: 'fire-extinguisher',
      label: 'Fire extinguisher of a type for the machine at the start line, or fire suppression fitted',
      kind: 'check',
      safety: true,
      ...PRACTICE,
    },
    {
      key: 'ballast-secured',
      label: 'Ballast secured to the structure, none loose',
      kind: 'check',
      allowNotApplicable: true,
      safety: true,
      ...PRACTICE,
    },
    {
      key: 'parachute',
      label: 'Parachutes fitted and packed: how many',
      kind: 'measure',
      unit: 'count',
      limit: { kind: 'count-for-speed', steps: PARACHUTE_STEPS },
      allowNotApplicable: true,
      notApplicableOn: ['none'],
      safety: true,
      source: 'club rules: one parachute above 175 mph, two above 300 mph of declared speed; an unstreamlined '
        + 'motorcycle carries none (from memory: the speeds and the machines vary by rulebook; the rulebook in force '
        + 'decides)',
      certainty: 'from memory',
    },
    {
      key: 'tyres-rated',
      safety: true,
      label: 'Tyres rated for the declared speed: the lowest rated speed of the tyres fitted',
      kind: 'measure',
      unit: 'km/h',
      limit: { kind: 'declared-speed' },
      source: 'club rule: above 200 mph, tyres designated by the maker for that use; speed symbols V 240, '
        + 'W 270, Y 300 km/h (ETRTO / ISO 4000-1, from memory); rated under the declared speed fails',
      certainty: 'seen',
    },
  ],
}

const streamlining: ChecklistSection = {
  title: 'Streamlining',
  items: [
    {
      key: 'canopy-exit',
      safety: true,
      label: 'Rider exits unaided with the canopy shut',
      kind: 'measure',
      unit: 's',
      limit: { kind: 'max', value: 30 },
      allowNotApplicable: true,
      source: CANOPY_EXIT_SOURCE,
      certainty: 'not settled',
    },
  ],
}

const riderKit: ChecklistSection = {
  title: 'Rider kit',
  items: [
    { key: 'helmet', label: 'Helmet to the current approved standard', kind: 'check', safety: true, ...SEEN },
    { key: 'leathers', label: 'Leathers, boots and gloves', kind: 'check', safety: true, ...SEEN },
    { key: 'back-protector', label: 'Back protector', kind: 'check', safety: true, ...SEEN },
  ],
}

const mass: ChecklistSection = {
  title: 'Mass',
  items: [
    {
      key: 'mass',
      label: 'Mass on a calibrated scale (the scale certificate is evidence)',
      kind: 'measure',
      unit: 'kg',
      limit: { kind: 'recorded' },
      source: 'published rulebook extracts: the mass decides the mass class, and is re-measured after a record',
      certainty: 'seen',
    } satisfies ChecklistItem,
  ],
}

const engine: ChecklistSection = {
  title: 'Engine',
  items: [
    {
      key: 'engine-capacity',
      label: 'Engine capacity, measured (bore and stroke) or sealed: swept volume of all cylinders',
      kind: 'measure',
      unit: 'cm³',
      limit: { kind: 'recorded' },
      source: 'published rulebook extracts: the capacity decides the capacity class',
      certainty: 'seen',
    },
  ],
}

export const electricMotorcycle: ChecklistTemplate = {
  id: 'electric-motorcycle',
  version: 1,
  name: 'Electric motorcycle',
  power: 'electric',
  sections: [riderControls, highVoltage, chassis, streamlining, riderKit, mass],
}

export const combustionMotorcycle: ChecklistTemplate = {
  id: 'combustion-motorcycle',
  version: 1,
  name: 'Combustion motorcycle',
  power: 'combustion',
  sections: [
    {
      ...riderControls,
      items: riderControls.items.map(i =>
        i.key === 'cutoff-lanyard'
          ? {
              ...i,
              label:
                'Emergency cut-off on the handlebar, tethered to the rider by a non-elastic lanyard, stops the engine',
            }
          : i,
      ),
    },
    chassis,
    streamlining,
    riderKit,
    mass,
    engine,
  ],
}

const driverSafety: ChecklistSection = {
  title: 'Driver safety',
  items: [
    {
      key: 'roll-structure',
      label: 'Roll structure around the driver, to the rulebook\'s dimensions, undamaged',
      kind: 'check',
      safety: true,
      ...PRACTICE,
    },
    {
      key: 'restraints',
      label: 'Driver restraints: harness within its date, mounted to the structure',
      kind: 'check',
      safety: true,
      ...PRACTICE,
    },
    {
      key: 'head-neck-restraint',
      label: 'Head and neck restraint worn with the helmet',
      kind: 'check',
      safety: true,
      ...PRACTICE,
    },
    {
      key: 'fire-suppression',
      label: 'Fire suppression fitted, charged, reachable by the driver and from outside',
      kind: 'check',
      safety: true,
      ...PRACTICE,
    },
    {
      key: 'driver-kit',
      label: 'Helmet to the current approved standard, fire-resistant suit, gloves and boots',
      kind: 'check',
      safety: true,
      ...SEEN,
    },
  ],
}

const enclosedCockpit: ChecklistSection = {
  title: 'Enclosed cockpit',
  items: [
    {
      key: 'cockpit-exit',
      label: 'Driver exits unaided with the canopy shut',
      kind: 'measure',
      unit: 's',
      limit: { kind: 'max', value: 30 },
      safety: true,
      source: CANOPY_EXIT_SOURCE,
      certainty: 'not settled',
    },
    {
      key: 'canopy-release-outside',
      label: 'Canopy release operable from outside by the marshals, marked',
      kind: 'check',
      safety: true,
      ...PRACTICE,
    },
  ],
}

const electricPowertrain: ChecklistSection = {
  ...highVoltage,
  items: highVoltage.items.filter(i => i.key !== 'live-rear-light'),
}

const carChassis = { ...chassis, items: chassis.items.filter(i => !['chain-guard', 'stands-removed'].includes(i.key)) }

/** A four-wheeled electric record car: driver safety, the high-voltage system, the machine, mass. */
export const electricAutomobile: ChecklistTemplate = {
  id: 'electric-automobile',
  version: 1,
  name: 'Electric automobile',
  power: 'electric',
  sections: [driverSafety, electricPowertrain, carChassis, mass],
}

/** A fully enclosed electric streamliner (two or more wheels): escape, roll structure, parachutes. */
export const electricStreamliner: ChecklistTemplate = {
  id: 'electric-streamliner',
  version: 1,
  name: 'Electric streamliner',
  power: 'electric',
  sections: [driverSafety, enclosedCockpit, electricPowertrain, chassis, mass],
}

/** A four-wheeled combustion record car: driver safety, the machine, mass and engine capacity. */
export const combustionAutomobile: ChecklistTemplate = {
  id: 'combustion-automobile',
  version: 1,
  name: 'Combustion automobile',
  power: 'combustion',
  sections: [
    driverSafety,
    carChassis,
    mass,
    engine,
  ],
}

export const checklistLibrary = {
  'electric-motorcycle': electricMotorcycle,
  'combustion-motorcycle': combustionMotorcycle,
  'electric-automobile': electricAutomobile,
  'electric-streamliner': electricStreamliner,
  'combustion-automobile': combustionAutomobile,
} as const
export type ChecklistId = keyof typeof checklistLibrary
export const CHECKLIST_IDS = Object.keys(checklistLibrary) as ChecklistId[]
