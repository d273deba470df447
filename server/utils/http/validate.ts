import type { H3Event } from 'h3'
import type { z } from 'zod'

export interface FieldIssue {
  path: string
  message: string
}

/** 422 naming every field at fault; the client shows each message beside its field. */
/** 422 for fields a schema cannot judge alone (a wrong password, a record of another event…). */
export function fieldsInvalid(issues: FieldIssue[], statusCode = 422) {
  return createError({
    statusCode,
    statusMessage: statusCode === 413 ? 'Too large' : 'Invalid input',
    message: issues.map(i => `${i.path}: ${i.message}`).join('; '),
    data: { issues },
  })
}

export const fieldInvalid = (path: string, message: string, statusCode = 422) =>
  fieldsInvalid([{ path, message }], statusCode)

export function invalidInput(error: z.ZodError) {
  const issues: FieldIssue[] = error.issues.map(i => ({ path: i.path.join('.') || '(body)', message: i.message }))
  return createError({
    statusCode: 422,
    statusMessage: 'Invalid input',
    message: issues.map(i => `${i.path}: ${i.message}`).join('; '),
    data: { issues },
  })
}

function parse<S extends z.ZodType>(schema: S, input: unknown): z.infer<S> {
  const r = schema.safeParse(input)
  if (!r.success) throw invalidInput(r.error)
  return r.data
}

/** The largest JSON body any route reads: a CSV import of 1 MB with its wrapping. */
export const JSON_BODY_LIMIT = 1_048_576

const tooLarge = (event: H3Event) => {
  // The rest of the body is not read: the connection closes after the answer.
  setResponseHeader(event, 'connection', 'close')
  return createError({
    statusCode: 413,
    statusMessage: 'Too large',
    message: `The request body is over ${JSON_BODY_LIMIT / 1_048_576} MB, the most any form sends`,
  })
}

/** The request's JSON, read up to the limit and refused beyond it (413), whatever the declared length. */
async function readJson(event: H3Event): Promise<unknown> {
  const declared = Number(getRequestHeader(event, 'content-length') ?? 0)
  if (declared > JSON_BODY_LIMIT) throw tooLarge(event)
  const chunks: Buffer[] = []
  let size = 0
  for await (const chunk of event.node.req as AsyncIterable<Buffer>) {
    size += chunk.length
    if (size > JSON_BODY_LIMIT) throw tooLarge(event)
    chunks.push(chunk)
  }
  const text = Buffer.concat(chunks).toString('utf8')
  if (!text.trim()) return {}
  try {
    return JSON.parse(text)
  }
  catch {
    throw createError({ statusCode: 400, statusMessage: 'The body is not valid JSON' })
  }
}

/** The path of the first text holding a NUL character, which no field takes and PostgreSQL refuses. */
function nulAt(value: unknown, path: string[] = []): string | null {
  if (typeof value === 'string') return value.includes('\u0000') ? path.join('.') || '(body)' : null
  if (value && typeof value === 'object') {
    for (const [k, v] of Object.entries(value)) {
      if (k.includes('\u0000')) return [...path, '(key)'].join('.')
      const found = nulAt(v, [...path, k])
      if (found) return found
    }
  }
  return null
}

export async function validBody<S extends z.ZodType>(event: H3Event, schema: S): Promise<z.infer<S>> {
  const body = await readJson(event)
  const nul = nulAt(body)
  if (nul) throw fieldInvalid(nul, 'must not hold a NUL character')
  return parse(schema, body ?? {})
}

export const validParams = <S extends z.ZodType>(event: H3Event, schema: S): z.infer<S> =>
  parse(schema, getRouterParams(event))
export const validQuery = <S extends z.ZodType>(event: H3Event, schema: S): z.infer<S> =>
  parse(schema, getQuery(event))
