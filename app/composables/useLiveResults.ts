import type { InternalApi } from 'nitropack/types'
import type { LiveMessage } from '#shared/types/live'

type Attempts = NonNullable<InternalApi['/api/events/:id/live']['get']>
export type LiveResults = { attempts: Attempts }

/** Applies a pushed message to the attempts held; null when it cannot (a delta from another version). */
export function applyLiveMessage(held: Attempts | null | undefined, version: number | null, msg: LiveMessage) {
  if (msg.kind === 'full') return msg.attempts as unknown as Attempts
  if (msg.kind !== 'delta' || !held || version !== msg.from) return null
  const byId = new Map(held.map(a => [a.id, a]))
  for (const a of msg.changed as unknown as Attempts) byId.set(a.id, a)
  return msg.order.map(id => byId.get(id)).filter(a => a !== undefined)
}

/**
 * The event's live results. With `stream`, the server pushes them (server-sent events: the whole, then
 * what changed); while no stream is open, and on pages that need no more, they are polled every
 * `everyMs`, revalidated by ETag. The server's clock comes with each message or the Date header, for
 * the countdowns.
 */
export function useLiveResults(eventId: Ref<string>, options: { everyMs?: number, stream?: boolean } = {}) {
  const serverNow = ref<string | null>(null)
  const streaming = ref(false)
  const result = useFetch(() => `/api/events/${eventId.value}/live`, {
    key: `live-${eventId.value}`,
    onResponse({ response }) {
      const date = response.headers.get('date')
      if (date) serverNow.value = new Date(date).toISOString()
    },
  })
  let version: number | null = null
  let source: EventSource | null = null
  let timer: ReturnType<typeof setInterval> | undefined
  function onMessage(e: MessageEvent<string>) {
    const msg = JSON.parse(e.data) as LiveMessage
    serverNow.value = msg.now
    if (msg.kind === 'tick') return
    const next = applyLiveMessage(result.data.value, version, msg)
    if (next) {
      result.data.value = next
      version = msg.version
    }
    else {
      version = null
      result.refresh()
    }
  }
  onMounted(() => {
    if (options.stream && 'EventSource' in window) {
      source = new EventSource(`/api/events/${eventId.value}/live-stream`)
      source.addEventListener('open', () => (streaming.value = true))
      source.addEventListener('error', () => (streaming.value = false))
      source.addEventListener('live', onMessage as EventListener)
    }
    timer = setInterval(() => {
      if (!streaming.value && document.visibilityState === 'visible') result.refresh()
    }, options.everyMs ?? 3000)
  })
  onBeforeUnmount(() => {
    clearInterval(timer)
    source?.close()
  })
  return { request: result, serverNow, streaming }
}
