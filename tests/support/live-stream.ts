import { expect } from 'vitest'
import type { LiveMessage } from '#shared/types/live'

/** A client of the live results stream, as a browser's EventSource reads it: each message with its arrival. */
export async function openLiveStream(base: string, eventId: number, cookie: string) {
  const controller = new AbortController()
  const r = await fetch(`${base}/api/events/${eventId}/live-stream`, {
    headers: { cookie, accept: 'text/event-stream' },
    signal: controller.signal,
  })
  const messages: { at: number, event: string, msg: LiveMessage }[] = []
  const reader = r.body!.pipeThrough(new TextDecoderStream()).getReader()
  /** When the server ended the stream (null while it is open). */
  const state = { endedAt: null as number | null }
  void (async () => {
    let buffer = ''
    for (;;) {
      const { value, done } = await reader.read()
      if (done) {
        state.endedAt = Date.now()
        return
      }
      buffer += value
      for (let i = buffer.indexOf('\n\n'); i >= 0; i = buffer.indexOf('\n\n')) {
        const lines = buffer.slice(0, i).split('\n')
        buffer = buffer.slice(i + 2)
        const field = (name: string) => lines.filter(l => l.startsWith(`${name}:`)).map(l => l.slice(name.length + 1).trim())
        const data = field('data').join('\n')
        if (data) messages.push({ at: Date.now(), event: field('event')[0] ?? 'message', msg: JSON.parse(data) })
      }
    }
  })().catch(() => {})
  /** The first message after `skip` others that meets `test`, waiting up to `timeoutMs`. */
  async function next(test: (m: LiveMessage) => boolean, skip = 0, timeoutMs = 10_000) {
    let found: (typeof messages)[number] | undefined
    await expect.poll(() => (found = messages.slice(skip).find(m => test(m.msg))), { timeout: timeoutMs }).toBeDefined()
    return found!
  }
  return { status: r.status, type: r.headers.get('content-type'), messages, next, state, close: () => controller.abort() }
}
