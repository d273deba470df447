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
