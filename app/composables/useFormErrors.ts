import type { FetchError } from 'ofetch'

interface Issue {
  path: string
  message: string
}

/** The one place that turns a server's 422 (or any error) into messages beside the fields. */
export function useFormErrors() {
  const fields = reactive<Record<string, string>>({})
  const general = ref('')
  function clear() {
    for (const k of Object.keys(fields)) delete fields[k]
    general.value = ''
  }
  function take(error: unknown) {
    clear()
    const e = error as FetchError<{ data?: { issues?: Issue[] }, message?: string, statusMessage?: string }>
    const issues = e?.data?.data?.issues
    if (e?.statusCode === 422 && issues?.length) {
      for (const i of issues) fields[i.path] = i.message
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
  function check(
    schema: {
      safeParse: (x: unknown) => {
        success: boolean
        error?: { issues: { path: PropertyKey[], message: string }[] }
      }
    },
    value: unknown,
    path: string,
  ) {
    const r = schema.safeParse(value)
    const issue = r.success ? undefined : r.error?.issues.find(i => i.path.join('.') === path)
    if (issue) fields[path] = issue.message
    else delete fields[path]
  }
  return reactive({ fields, general, clear, take, check })
}
