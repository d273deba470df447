// Everyone at the event sees the live results. Pages poll this every few seconds: the results are
// computed once per event version and revalidated by ETag, so an unchanged poll costs two queries
// and a 304. The server's clock travels in the Date header.
export default defineEventHandler(async (event) => {
  const { eventId } = await requireEventRole(event, 'any', { admin: true })
  const { version, etag } = await liveResultsTag(eventId)
  setHeader(event, 'etag', etag)
  setHeader(event, 'cache-control', 'private, no-cache')
  if (getRequestHeader(event, 'if-none-match') === etag) {
    setResponseStatus(event, 304)
    return null
  }
  setHeader(event, 'content-type', 'application/json; charset=utf-8')
  return (await liveResultsJson(eventId, version)) as unknown as ReturnType<typeof computeLive>
})
