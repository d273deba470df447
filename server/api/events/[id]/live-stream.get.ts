// Live results pushed as server-sent events: the whole first, then only the attempts that changed, within
// a second of a write on any app server. A stream ends after a few minutes and the browser's EventSource
// opens it again, so the session and the role are checked again. The page polls `live` when it cannot.
const STREAM_MS = 5 * 60_000
/** How often an open stream checks that its session stands and the person still holds a role at the event. */
const RECHECK_MS = 3_000

export default defineEventHandler(async (event) => {
  const { eventId } = await requireEventRole(event, 'any', { admin: true })
  setHeader(event, 'x-accel-buffering', 'no')
  const stream = createEventStream(event)
  const leave = await joinLiveStream(eventId, data => void stream.push({ event: 'live', data }).catch(() => {}))
  const end = setTimeout(() => void stream.close(), STREAM_MS)
  // A role removed, a session ended or signed out everywhere: the stream ends within seconds, not minutes.
  const recheck = setInterval(() => {
    sessionStillHolds(event, eventId).then((ok) => {
      if (!ok) void stream.close()
    }).catch(() => void stream.close())
  }, RECHECK_MS)
  stream.onClosed(async () => {
    clearTimeout(end)
    clearInterval(recheck)
    leave()
    await stream.close()
  })
  return stream.send()
})
