import { bench, describe } from 'vitest'
import { profiles } from '#shared/rules/profiles'
import { plan } from '#shared/rules/planner/plan'

// Figures for the closing notes: a full plan (both runs, the two solves, nine sensitivity rows) per call.
const input = {
  machine: {
    massKg: 300, rotatingMassKg: 20, cdA: 0.12, crr: 0.012, efficiency: 0.92,
    power: { kind: 'constant' as const, kW: 150 }, maxTractiveN: 2500,
  },
  conditions: { altitudeM: 1290, temperatureC: 27.5, pressureHpa: 872.4, windMs: 2, windFromDeg: 0 },
  course: { label: 'Flying mile', lengthM: 8000, headingDeg: 0, entryM: 3500, exitM: 5109.344 },
  shutdown: { decelerationMs2: 3, marginM: 300 },
  profile: profiles['intl-motorcycle'],
  recordKmh: 330,
  turnaroundMin: 45,
}

describe('attempt planner', () => {
  bench('a full plan with sensitivity, an 8 km course', () => {
    plan(input)
  })
})
