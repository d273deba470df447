import { bench, describe } from 'vitest'
import { calculate } from '#shared/rules/calculator'
import { evaluateAttempt } from '#shared/rules/attempt'
import { fromDecimal } from '#shared/rules/exact'
import { profiles } from '#shared/rules/profiles'

// Figures for the closing notes: how fast the engine evaluates an attempt, exactly, per call.
const mile = fromDecimal('1609.344')
const runs = [
  { direction: 'out' as const, startedAtMs: Date.parse('2026-08-14T09:00:00Z'), elapsedS: fromDecimal('5.767') },
  { direction: 'back' as const, startedAtMs: Date.parse('2026-08-14T09:40:00Z'), elapsedS: fromDecimal('5.599') },
]

describe('rules engine', () => {
  bench('evaluateAttempt, two runs and a record', () => {
    evaluateAttempt({ profile: profiles['intl-automobile'], distanceM: mile, runs, record: { value: fromDecimal('630.388'), unit: 'mph' } })
  })
  bench('calculate (the calculator request to response)', () => {
    calculate({
      profile: 'club-same-direction', distanceM: 1609.344, timeZone: 'America/Denver', recordKmh: 400,
      runs: [
        { direction: 'out', startedAt: '2026-08-14T15:00:00Z', elapsedS: '14.2031' },
        { direction: 'out', startedAt: '2026-08-15T14:00:00Z', elapsedS: '14.1187' },
      ],
    })
  })
})
