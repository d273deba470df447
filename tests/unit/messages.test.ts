import { describe, expect, it } from 'vitest'
import { z } from 'zod'
import * as auth from '#shared/schemas/auth'
import * as calculator from '#shared/schemas/calculator'
import * as deviceImport from '#shared/schemas/device-import'
import * as eventDay from '#shared/schemas/event-day'
import * as events from '#shared/schemas/events'
import * as evidence from '#shared/schemas/evidence'
import * as inspection from '#shared/schemas/inspection'
import * as paper from '#shared/schemas/paper'
import * as passkeys from '#shared/schemas/passkeys'
import * as recordBook from '#shared/schemas/record-book'
import { fieldLabel } from '#shared/utils/field-label'

// Every schema the forms and the routes share, given the wrong things a person (or a broken form) sends:
// nothing, empty text, text where a number goes, a number where text goes, absurd sizes. No message may
// carry the schema library's own wording; each is a phrase that follows the field's label.
const schemas = Object.entries({ auth, calculator, deviceImport, eventDay, events, evidence, inspection, paper, passkeys, recordBook })
  .flatMap(([file, m]) => Object.entries(m).filter(([, s]) => s instanceof z.ZodType).map(([name, s]) => [`${file}.${name}`, s as z.ZodType] as const))

const LIBRARY_WORDING = /expected|received|invalid input|invalid_|too_small|too_big|nonoptional|undefined|NaN/i

function shapeOf(s: z.ZodType): Record<string, unknown> {
  const def = (s as { def?: { shape?: Record<string, unknown> } }).def
  return def?.shape ?? {}
}

const badValues: unknown[] = [undefined, null, '', '   ', 'x', -1, 0, 1e21, 0.0001, true, [], {}, 'a'.repeat(5000)]

describe('error messages a person can see', () => {
  it('finds the shared schemas', () => {
    expect(schemas.length).toBeGreaterThan(30)
  })

  it.each(schemas)('%s never shows the schema library\'s wording', (_name, schema) => {
    const seen: string[] = []
    for (const whole of [undefined, null, {}, [], 'x', 5]) {
      const r = schema.safeParse(whole)
      if (!r.success) seen.push(...r.error.issues.map(i => i.message))
    }
    for (const key of Object.keys(shapeOf(schema))) {
      for (const bad of badValues) {
        const r = schema.safeParse({ [key]: bad })
        if (!r.success) seen.push(...r.error.issues.map(i => i.message))
      }
    }
    expect(seen.length).toBeGreaterThan(0)
    expect(seen.filter(m => LIBRARY_WORDING.test(m))).toEqual([])
  })

  it('says a missing field is required and a word where a number goes must be a number', () => {
    const r = eventDay.startRunSchema.safeParse({ direction: 'sideways', entryId: 'seven' })
    const byPath = Object.fromEntries(r.error!.issues.map(i => [i.path.join('.'), i.message]))
    expect(byPath.entryId).toBe('must be a number')
    expect(byPath.direction).toBe('must be one of “out”, “back”')
    expect(eventDay.startRunSchema.safeParse({ direction: 'out' }).error!.issues[0]!.message).toBe('is required')
  })

  it('names a field in the words of a form', () => {
    expect(fieldLabel('entryId')).toBe('Entry —')
    expect(fieldLabel('calibrationExpires')).toBe('Calibration expires —')
    expect(fieldLabel('traps.2.label')).toBe('Traps, 3, label —')
  })
})

describe('decimals as people type them', () => {
  // Much of Europe writes a decimal comma (ISO 80000-1 allows comma or point as the decimal sign): "14,50" is 14.50
  // wherever a decimal is typed; a comma beside a point, or two commas, is not a number.
  it('reads a decimal comma as a point in times, speeds, masses and trap times', () => {
    const calc = calculator.calculatorRequestSchema.parse({ profile: 'intl-motorcycle', distanceM: '1000', recordKmh: '246,069', runs: [{ direction: 'out', startedAt: '2026-08-14T07:00:00Z', elapsedS: '14,63' }] })
    expect(calc.runs[0]!.elapsedS).toBe('14.63')
    expect(calc.recordKmh).toBe('246.069')
    expect(eventDay.timeOfDay.parse('10:15:02,1234')).toBe('10:15:02.1234')
    expect(eventDay.timeOfDay.safeParse('10,15:02').success).toBe(false)
    expect(inspection.answerSchema.parse({ itemKey: 'bonding', result: 'pass', value: '0,05', unit: 'Ω' }).value).toBe('0.05')
    expect(inspection.postRunCheckSchema.parse({ massKg: '181,5', capacityCm3: '998,25', typedName: 'A. Scrutineer', password: 'p' })).toMatchObject({ massKg: 181.5, capacityCm3: 998.25 })
  })
  it('refuses a comma beside a point, or two commas, in plain words', () => {
    for (const bad of ['1.234,5', '1,234,5', ',']) {
      const r = calculator.calculatorRunSchema.safeParse({ direction: 'out', startedAt: '2026-08-14T07:00:00Z', elapsedS: bad })
      expect(r.error!.issues[0]!.message, bad).toBe('must be a number, such as 14.50')
    }
    const when = calculator.calculatorRunSchema.safeParse({ direction: 'out', startedAt: '14/08/2026 7:00', elapsedS: '5' })
    expect(when.error!.issues[0]!.message).toBe('must be a date and time with its zone, such as 2026-08-14T07:05:00Z')
  })
})
