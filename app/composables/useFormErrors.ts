import type { FetchError } from 'ofetch'

interface Issue {
  path: string
  message: string
}

/** A shared zod schema, as far as the form needs it. */
interface Checkable {
  safeParse: (x: unknown) => { success: boolean, error?: { issues: { path: PropertyKey[], message: string }[] } }
}

/** A server's message for a person, never a bare status word. */
function plainGeneral(e: FetchError<{ message?: string, statusMessage?: string }> | undefined) {
  if (!e?.statusCode) return 'No answer from the server: nothing was saved. Check the link and try again.'
  const text = e.data?.message || e.data?.statusMessage || e.statusMessage || ''
  if (!text || /^(Invalid input|Bad Request|Internal Server Error|Server Error|Unprocessable)/i.test(text)) {
    return 'Something went wrong; nothing was saved. Try again.'
  }
  return text
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
    // Cleared first and set after this tick, so the same message after a second send shows again.
    void nextTick(() => {
      if ((e?.statusCode === 422 || e?.statusCode === 413) && issues?.length) {
        fields.value = Object.fromEntries(issues.map(i => [i.path, i.message]))
        // Also above the button, each with its field named: a field this form does not show is never lost.
        general.value = `Nothing was saved. ${issues.map(i => `${fieldLabel(i.path)} ${i.message}`).join('; ')}.`
      }
      else {
        general.value = plainGeneral(e)
      }
    })
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
