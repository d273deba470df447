import type { H3Event } from 'h3'
import type { z } from 'zod'

export interface FieldIssue {
  path: string
  message: string
}

/** 422 naming every field at fault; the client shows each message beside its field. */
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
  } catch {
    throw createError({ statusCode: 400, statusMessage: 'The body is not valid JSON' })
  }
  return parse(schema, body ?? {})
}

export const validParams = <S extends z.ZodType>(event: H3Event, schema: S): z.infer<S> => parse(schema, getRouterParams(event))
export const validQuery = <S extends z.ZodType>(event: H3Event, schema: S): z.infer<S> => parse(schema, getQuery(event))
