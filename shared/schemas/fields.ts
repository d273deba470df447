import { z } from 'zod'
import './messages'
import { fromInput, MAX_DECIMAL_CHARS } from '../rules/exact'
import { isTimeZone } from '../rules/zoned'

/** A number field left empty is required; anything else there must be a number. */
export const numberOrRequired = (issue: { input?: unknown }) =>
  (issue.input === undefined || issue.input === null || issue.input === '' ? 'is required' : 'must be a number')

/**
 * A number typed with a decimal comma ("14,50", as much of Europe writes it) read as with a point; anything else as
 * it is (a comma with a point, or two commas, stays and is refused as not a number).
 */
export const decimalComma = (v: unknown) =>
  (typeof v === 'string' && /^\s*[+-]?\d*,\d+\s*$/.test(v) ? v.replace(',', '.') : v)

/** A positive, finite amount given as a JSON number or an exact decimal string ("5.767", or "5,767"). */
export const positiveDecimal = z.preprocess(decimalComma, z.union([z.number(), z.string()])).superRefine((x, ctx) => {
  if (typeof x === 'string' && x.length > MAX_DECIMAL_CHARS) {
    ctx.addIssue({ code: 'custom', message: `must be at most ${MAX_DECIMAL_CHARS} characters` })
    return
  }
  try {
    if (fromInput(x).n <= 0n) ctx.addIssue({ code: 'custom', message: 'must be greater than zero' })
  }
  catch {
    ctx.addIssue({ code: 'custom', message: 'must be a number, such as 14.50' })
  }
})

export const positiveNumber = z
  .number({ error: numberOrRequired })
  .finite()
  .positive({ error: 'must be greater than zero' })

/** The largest id PostgreSQL's integer (serial) columns hold. */
export const MAX_RECORD_ID = 2_147_483_647

/** The id of a stored record: a positive integer within the database's range, from a number or text. */
export const recordId = z.preprocess(
  v => (typeof v === 'string' && /^\s*\d+\s*$/.test(v) ? Number(v) : v),
  z.number({ error: numberOrRequired })
    .int({ error: 'must be a whole number' })
    .positive({ error: 'must be a positive number' })
    .max(MAX_RECORD_ID, { error: 'is not the id of any record' }),
)

/** ISO-8601 date and time with Z or an offset, e.g. 2026-08-14T07:05:00Z; said in plain words when it is not. */
export const isoDateTime = z.iso.datetime({
  offset: true,
  error: 'must be a date and time with its zone, such as 2026-08-14T07:05:00Z',
})

export const timeZoneName = z
  .string()
  .refine(isTimeZone, { error: 'must be an IANA time zone such as UTC or America/Denver' })

export const email = z
  .string()
  .trim()
  .toLowerCase()
  .pipe(z.email({ error: 'must be an e-mail address' }))
export const password = z.string().min(10, { error: 'must be at least 10 characters' }).max(200)
