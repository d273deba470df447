import { z } from 'zod'
import './messages'
import { fromInput, MAX_DECIMAL_CHARS } from '../rules/exact'
import { isTimeZone } from '../rules/zoned'

/** A number field left empty is required; anything else there must be a number. */
export const numberOrRequired = (issue: { input?: unknown }) =>
  (issue.input === undefined || issue.input === null || issue.input === '' ? 'is required' : 'must be a number')

/** A positive, finite amount given as a JSON number or an exact decimal string ("5.767"). */
export const positiveDecimal = z.union([z.number(), z.string()]).superRefine((x, ctx) => {
  if (typeof x === 'string' && x.length > MAX_DECIMAL_CHARS) {
    ctx.addIssue({ code: 'custom', message: `must be at most ${MAX_DECIMAL_CHARS} characters` })
    return
  }
  try {
    if (fromInput(x).n <= 0n) ctx.addIssue({ code: 'custom', message: 'must be greater than zero' })
  }
  catch {
    ctx.addIssue({ code: 'custom', message: 'must be a finite decimal number' })
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

/** ISO-8601 date and time with Z or an offset, e.g. 2026-08-14T07:05:00Z. */
export const isoDateTime = z.iso.datetime({
  offset: true,
  error: 'must be an ISO-8601 date and time with Z or an offset',
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
