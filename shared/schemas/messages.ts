import { z } from 'zod'

/**
 * Every message a schema gives when its own wording is not set, in the words people use: it follows the
 * field's label beside the field ("Speed — must be a number"), and never shows the schema library's
 * wording ("expected string, received undefined", "Invalid input"). Set once for the server and the pages.
 */
type Issue = Parameters<NonNullable<z.core.$ZodConfig['customError']>>[0]

const kinds: Record<string, string> = {
  string: 'text', number: 'a number', int: 'a whole number', bigint: 'a whole number', boolean: 'yes or no',
  date: 'a date', array: 'a list', object: 'a set of fields', nan: 'a number',
}
const unit = (origin: unknown) => (origin === 'string' ? ' characters' : origin === 'array' ? ' items' : '')
const quoted = (values: readonly unknown[]) => values.map(v => `“${String(v)}”`).join(', ')

export function plainMessage(issue: Issue): string {
  switch (issue.code) {
    case 'invalid_type':
      if (issue.input === undefined || issue.input === null || issue.input === '') return 'is required'
      return `must be ${kinds[issue.expected] ?? issue.expected}`
    case 'too_small':
      if (issue.origin === 'string' && Number(issue.minimum) === 1) return 'is required'
      if (issue.origin === 'array' && Number(issue.minimum) === 1) return 'needs at least one'
      return `must be at least ${String(issue.minimum)}${unit(issue.origin)}`
    case 'too_big':
      return `must be at most ${String(issue.maximum)}${unit(issue.origin)}`
    case 'invalid_value':
      return issue.values.length === 1 ? `must be ${quoted(issue.values)}` : `must be one of ${quoted(issue.values)}`
    case 'invalid_format':
      return issue.format === 'email'
        ? 'must be an e-mail address'
        : issue.format === 'regex'
          ? 'is not in the expected form'
          : `must be a valid ${issue.format.replace(/_/g, ' ')}`
    case 'not_multiple_of':
      return `must be a multiple of ${String(issue.divisor)}`
    case 'unrecognized_keys':
      return `has fields this form does not take: ${issue.keys.join(', ')}`
    case 'invalid_union':
    case 'invalid_key':
    case 'invalid_element':
    case 'custom':
    default:
      return 'is not valid here; check what was typed'
  }
}

z.config({ customError: plainMessage })
