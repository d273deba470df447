import { defineStore } from 'pinia'
import type { FetchError } from 'ofetch'

/** A write as a component hands it over; `offlineBody` replaces the body if it has to wait (a run's start). */
type NewWrite = Omit<QueuedWrite, 'seq' | 'key' | 'state' | 'message' | 'createdAt'> & {
  offlineBody?: Record<string, unknown>
}

/** Thrown to the caller when the server refused a write sent at once (the cell shows why). */
type Refusal = FetchError

const RETRY_MS = 5000
const RUN_REF = /\{run:([\w-]+)\}/

/** The server's words for a refusal: its message, or the first field's. */
function refusalMessage(e: Refusal) {
  const data = e.data as {
    statusMessage?: string
    message?: string
    data?: { issues?: { path: string, message: string }[] }
  }
  const issue = data?.data?.issues?.[0]
  if (issue) return `${issue.path}: ${issue.message}`
  return data?.statusMessage || data?.message || e.statusMessage || 'refused'
}
const isNetworkFailure = (e: unknown) => !(e as FetchError)?.statusCode

/**
 * The run sheet's writes, kept in the browser until the server has them: sent at once when the link is up
 * and nothing waits before them; else queued in order (IndexedDB) and sent when the link returns, each with
 * its Idempotency-Key. A write the server refuses on arrival (a time entered or corrected meanwhile by
 * another timekeeper, a sheet signed meanwhile) is kept as a conflict for the timekeeper to resolve.
 */
export const useOutboxStore = defineStore('outbox', () => {
  const items = ref<QueuedWrite[]>([])
  const online = ref(true)
  const sending = ref(false)
  const listeners = new Set<() => void>()
  let started = false

  async function load(eventId: string) {
    if (!(await outboxExists())) return
    items.value = await (await outboxDb()).writes.where('eventId').equals(eventId).sortBy('seq')
  }

  /** Starts watching the link (once, in the browser) and loads what the event's queue holds. */
  async function start(eventId: string) {
    await load(eventId)
    if (!started) {
      started = true
      online.value = navigator.onLine
      window.addEventListener('online', () => {
        online.value = true
        void flush()
      })
      window.addEventListener('offline', () => (online.value = false))
      // The store lives as long as the page: its retry timer too.
      setInterval(() => {
        if (items.value.some(i => i.state === 'waiting')) void flush()
      }, RETRY_MS)
    }
    void flush()
  }

  /** Called after writes reach the server, so the sheet reads them back. */
  function onSent(fn: () => void) {
    listeners.add(fn)
    return () => listeners.delete(fn)
  }

  /** The id a run reference stands for: itself, or a queued run's once it is written (else undefined). */
  async function runIdOf(ref: string) {
    const m = RUN_REF.exec(ref)
    return m ? (await (await outboxDb()).runIds.get(m[1]!))?.id : Number(ref)
  }
  async function resolveUrl(url: string) {
    const m = RUN_REF.exec(url)
    if (!m) return url
    const id = await runIdOf(m[0])
    return id ? url.replace(m[0], String(id)) : null
  }

  /** Any queued url: plain, not matched against every route's type (the queue holds several kinds). */
  const postAny = $fetch as unknown as (url: string, options: object) => Promise<{ id: number }>
  function post(url: string, body: Record<string, unknown>, key: string) {
    return postAny(url, { method: 'POST', body, headers: { 'idempotency-key': key } })
  }

  /**
   * Writes now where it can, or keeps the write for later. Resolves 'sent' or 'queued'; a refusal of a write
   * sent at once is thrown to the caller, as before (an invalid time is shown beside its cell).
   */
  async function write(w: NewWrite) {
    const { offlineBody, ...rest } = w
    const entry: QueuedWrite = {
      ...rest,
      key: crypto.randomUUID(),
      state: 'waiting',
      message: '',
      createdAt: Date.now(),
    }
    const url = await resolveUrl(entry.url)
    if (url && navigator.onLine && !items.value.length) {
      try {
        const answer = await post(url, entry.body, entry.key)
        return { state: 'sent' as const, answer, seq: null }
      }
      catch (e) {
        if (!isNetworkFailure(e)) throw e
      }
    }
    if (offlineBody) entry.body = offlineBody
    entry.seq = await (await outboxDb()).writes.add(entry)
    items.value.push(entry)
    online.value = navigator.onLine
    if (online.value) void flush()
    return { state: 'queued' as const, answer: null, seq: entry.seq }
  }

  async function settle(item: QueuedWrite, patch: Partial<QueuedWrite> | null) {
    const store = (await outboxDb()).writes
    if (patch) await store.update(item.seq!, patch)
    else await store.delete(item.seq!)
    items.value = patch
      ? items.value.map(i => (i.seq === item.seq ? { ...i, ...patch } : i))
      : items.value.filter(i => i.seq !== item.seq)
  }

  /** Sends what waits, in order; stops at the first failure of the link and tries again later. */
  async function flush() {
    if (sending.value) return
    sending.value = true
    let sent = 0
    try {
      for (const item of [...items.value]) {
        if (item.state !== 'waiting') continue
        const url = await resolveUrl(item.url)
        if (!url) {
          await settle(item, { state: 'conflict', message: 'its run was not written' })
          continue
        }
        try {
          const answer = await post(url, item.body, item.key)
          if (item.kind === 'run') await (await outboxDb()).runIds.put({ key: item.key, id: answer.id })
          await settle(item, null)
          sent++
        }
        catch (e) {
          if (isNetworkFailure(e)) {
            online.value = false
            break
          }
          const standing = ((e as Refusal).data as { data?: { current?: { id?: number | string } } })?.data?.current?.id
          await settle(item, {
            state: 'conflict',
            message: refusalMessage(e as Refusal),
            ...(standing ? { standingId: Number(standing) } : {}),
          })
        }
      }
      if (sent) online.value = true
    }
    finally {
      sending.value = false
    }
    if (sent) listeners.forEach(fn => fn())
  }

  /** A conflict is dropped (the server's value stands) or sent again as changed by the timekeeper. */
  const discard = (item: QueuedWrite) => settle(item, null)
  async function sendAgain(item: QueuedWrite, change: Partial<Pick<QueuedWrite, 'url' | 'body' | 'kind' | 'label'>>) {
    await settle(item, { ...change, state: 'waiting', message: '', key: crypto.randomUUID() })
    await flush()
  }

  const waiting = computed(() => items.value.filter(i => i.state === 'waiting'))
  const conflicts = computed(() => items.value.filter(i => i.state === 'conflict'))
  return { items, waiting, conflicts, online, sending, start, write, flush, discard, sendAgain, onSent, runIdOf }
})
