import type { InternalApi } from 'nitropack/types'

export type LiveResults = InternalApi['/api/events/:id/live']['get']

/** The event's live results, refreshed every few seconds while the page is open and visible. */
export function useLiveResults(eventId: Ref<string>, everyMs = 3000) {
  const result = useFetch(() => `/api/events/${eventId.value}/live`, { key: `live-${eventId.value}` })
  let timer: ReturnType<typeof setInterval> | undefined
  onMounted(() => {
    timer = setInterval(() => { if (document.visibilityState === 'visible') result.refresh() }, everyMs)
  })
  onBeforeUnmount(() => clearInterval(timer))
  return result
}
