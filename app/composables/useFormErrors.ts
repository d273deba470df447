import type { FetchError } from 'ofetch'

interface Issue {
  path: string
  message: string
}

/** A shared zod schema, as far as the form needs it. */
interface Checkable {
  safeParse: (x: unknown) => { success: boolean, error?: { issues: { path: PropertyKey[], message: string }[] } }
}

/** The one place that turns a server's 422 (or any error) into messages beside the fields. */
export function useFormErrors() {
  const fields = ref<Record<string, string>>({})
  const general = ref('')
  function clear() {
    fields.value = {}
    general.value = ''
  }
  function take(error: unknown) {
    clear()
    const e = error as FetchError<{ data?: { issues?: Issue[] }, message?: string, statusMessage?: string }>
    const issues = e?.data?.data?.issues
    if (e?.statusCode === 422 && issues?.length) {
      fields.value = Object.fromEntries(issues.map(i => [i.path, i.message]))
    }
    else {
      general.value
        = e?.data?.message
          || e?.data?.statusMessage
          || e?.statusMessage
          || 'Something went wrong; nothing was saved. Try again.'
    }
  }
  /** Checks one field with a shared zod schema as the person leaves it. */
  function check(schema: Checkable, value: unknown, path: string) {
    const r = schema.safeParse(value)
    const issue = r.success ? undefined : r.error?.issues.find(i => i.path.join('.') === path)
    const { [path]: _old, ...others } = fields.value
    fields.value = issue ? { ...others, [path]: issue.message } : others
  }
  /** Checks a whole form with its shared zod schema before sending; false when any field is wrong. */
  function checkAll(schema: Checkable, value: unknown) {
    clear()
    const r = schema.safeParse(value)
    fields.value = Object.fromEntries((r.error?.issues ?? []).map(i => [i.path.join('.'), i.message]))
    return r.success
  }
  return reactive({ fields, general, clear, take, check, checkAll })
}
