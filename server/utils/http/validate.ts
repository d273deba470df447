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

export async function validBody<S extends z.ZodType>(event: H3Event, schema: S): Promise<z.infer<S>> {
  let body: unknown
  try {
    body = await readBody(event)
  }
  catch {
    throw createError({ statusCode: 400, statusMessage: 'The body is not valid JSON' })
  }
  return parse(schema, body ?? {})
}

export const validParams = <S extends z.ZodType>(event: H3Event, schema: S): z.infer<S> =>
  parse(schema, getRouterParams(event))
export const validQuery = <S extends z.ZodType>(event: H3Event, schema: S): z.infer<S> =>
  parse(schema, getQuery(event))
