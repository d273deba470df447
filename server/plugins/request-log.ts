// With NUXT_REQUEST_LOG=json, one JSON line per request on standard output: when, this server, method, path
// (never the query, which may carry a one-time link's token), status, duration and the signed-in person's id.
// No body, no cookie, no address: nothing secret or personal beyond an id. A log collector reads the lines.
export default defineNitroPlugin((nitro) => {
  const { requestLog, serverId } = useRuntimeConfig()
  if (requestLog !== 'json') return
  nitro.hooks.hook('request', (event) => {
    event.context.startedAt = performance.now()
  })
  nitro.hooks.hook('afterResponse', (event) => {
    const started = event.context.startedAt as number | undefined
    process.stdout.write(`${JSON.stringify({
      t: new Date().toISOString(),
      server: serverId,
      method: event.method,
      path: event.path.split('?')[0],
      status: getResponseStatus(event),
      ms: started === undefined ? null : Math.round((performance.now() - started) * 10) / 10,
      user: (event.context.userId as number | undefined) ?? null,
    })}\n`)
  })
})
