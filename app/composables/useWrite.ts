/**
 * The one way the browser writes: the request is a `$fetch` to the route, typed by the route's own
 * file at the call; this adds a pending flag while it runs, the server's field errors beside the
 * form's fields, and a message once it is saved.
 *
 *   const write = useWrite()
 *   write.send(() => $fetch(`/api/runs/${id}/weather`, { method: 'POST', body }), () => 'Weather saved.')
 *   write.errors.fields.windSpeedMs · write.errors.general · write.pending · write.saved
 */
export function useWrite() {
  const errors = useFormErrors()
  const pending = ref(false)
  const saved = ref('')
  /**
   * Sends; on success runs `then` with the answer (its return, if a string, is the saved message)
   * and resolves true; on failure keeps the errors for the form and resolves false, unless
   * `handled` recognises the error and deals with it (it returns true).
   */
  async function send<T>(
    request: () => Promise<T>,
    then?: (answer: T) => unknown,
    handled?: (error: unknown) => boolean,
  ): Promise<boolean> {
    pending.value = true
    saved.value = ''
    try {
      const answer = await request()
      errors.clear()
      const message = await then?.(answer)
      if (typeof message === 'string') saved.value = message
      return true
    }
    catch (e) {
      if (!handled?.(e)) errors.take(e)
      return false
    }
    finally {
      pending.value = false
    }
  }
  return reactive({ errors, pending, saved, send })
}
