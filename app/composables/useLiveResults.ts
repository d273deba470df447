import type { InternalApi } from 'nitropack/types'

export type LiveResults = { attempts: NonNullable<InternalApi['/api/events/:id/live']['get']> }

/**
 * The event's live results, polled every few seconds while the page is visible. The browser
 * revalidates with the ETag, so an unchanged poll is a 304; the server's clock comes from the
 * Date header, for the countdowns.
 */
export function useLiveResults(eventId: Ref<string>, everyMs = 3000) {
  const serverNow = ref<string | null>(null)
  const result = useFetch(() => `/api/events/${eventId.value}/live`, {
    key: `live-${eventId.value}`,
    onResponse({ response }) {
      const date = response.headers.get('date')
      if (date) serverNow.value = new Date(date).toISOString()
    },
  })
  let timer: ReturnType<typeof setInterval> | undefined
  onMounted(() => {
    timer = setInterval(() => {
      if (document.visibilityState === 'visible') result.refresh()
    }, everyMs)
  })
  onBeforeUnmount(() => clearInterval(timer))
  return { request: result, serverNow }
}
