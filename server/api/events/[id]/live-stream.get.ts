// Live results pushed as server-sent events: the whole first, then only the attempts that changed, within
// a second of a write on any app server. A stream ends after a few minutes and the browser's EventSource
// opens it again, so the session and the role are checked again. The page polls `live` when it cannot.
const STREAM_MS = 5 * 60_000

export default defineEventHandler(async (event) => {
  const { eventId } = await requireEventRole(event, 'any', { admin: true })
  setHeader(event, 'x-accel-buffering', 'no')
  const stream = createEventStream(event)
  const leave = await joinLiveStream(eventId, data => void stream.push({ event: 'live', data }).catch(() => {}))
  const end = setTimeout(() => void stream.close(), STREAM_MS)
  stream.onClosed(async () => {
    clearTimeout(end)
    leave()
    await stream.close()
  })
  return stream.send()
})
