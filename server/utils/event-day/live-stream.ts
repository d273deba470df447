// Live results pushed to the pages that hold a stream open (server-sent events). One hub per event on
// this server: told of each new version by PostgreSQL (live-notify.ts), it computes the results once
// (the shared cache of live-cache.ts), works out which attempts changed, and sends every subscriber
// only those, with the order of all attempts; a subscriber not at the previous version gets the whole.
// The messages are `LiveMessage` (shared/types/live.ts).

interface Subscriber {
  version: number
  send: (data: string) => void
}

interface Hub {
  eventId: number
  version: number
  json: string
  parts: Map<number, string>
  subscribers: Set<Subscriber>
  ready: Promise<() => void>
  running: boolean
  again: boolean
  ticker: ReturnType<typeof setInterval>
}

const TICK_MS = 15_000
const hubs = new Map<number, Hub>()

const fullMessage = (hub: Hub, now: string) =>
  `{"kind":"full","version":${hub.version},"now":"${now}","attempts":${hub.json}}`

function deliver(sub: Subscriber, data: string, version: number) {
  sub.version = version
  sub.send(data)
}

/** Reads the newest version, and sends what changed; a call while one runs makes it go round again. */
async function refresh(hub: Hub) {
  if (hub.running) {
    hub.again = true
    return
  }
  hub.running = true
  try {
    do {
      hub.again = false
      const { version } = await liveResultsTag(hub.eventId)
      if (version === hub.version) continue
      const json = await liveResultsJson(hub.eventId, version)
      const attempts = JSON.parse(json) as { id: number }[]
      const parts = new Map(attempts.map(a => [a.id, JSON.stringify(a)]))
      const changed = [...parts].filter(([id, s]) => hub.parts.get(id) !== s).map(([, s]) => s)
      const from = hub.version
      Object.assign(hub, { version, json, parts })
      const now = new Date().toISOString()
      const order = JSON.stringify(attempts.map(a => a.id))
      const delta = `{"kind":"delta","from":${from},"version":${version},"now":"${now}",`
        + `"order":${order},"changed":[${changed.join(',')}]}`
      for (const sub of hub.subscribers)
        deliver(sub, from >= 0 && sub.version === from ? delta : fullMessage(hub, now), version)
    } while (hub.again)
  }
  finally {
    hub.running = false
  }
}

function openHub(eventId: number): Hub {
  const hub: Hub = {
    eventId,
    version: -1,
    json: '[]',
    parts: new Map(),
    subscribers: new Set(),
    running: false,
    again: false,
    ready: null as unknown as Promise<() => void>,
    ticker: setInterval(() => {
      const tick = `{"kind":"tick","now":"${new Date().toISOString()}"}`
      for (const sub of hub.subscribers) sub.send(tick)
    }, TICK_MS),
  }
  hub.ready = listenLiveVersions(eventId, () => void refresh(hub).catch(() => {}))
  hubs.set(eventId, hub)
  return hub
}

function closeHub(hub: Hub) {
  hubs.delete(hub.eventId)
  clearInterval(hub.ticker)
  void hub.ready.then(stop => stop())
}

/**
 * Subscribes `send` to the event's live results: the whole first, then what changes. Returns the
 * function that leaves.
 */
export async function joinLiveStream(eventId: number, send: (data: string) => void): Promise<() => void> {
  const hub = hubs.get(eventId) ?? openHub(eventId)
  const sub: Subscriber = { version: -1, send }
  hub.subscribers.add(sub)
  const leave = () => {
    hub.subscribers.delete(sub)
    if (!hub.subscribers.size && hubs.get(eventId) === hub) closeHub(hub)
  }
  try {
    await hub.ready
    if (hub.version < 0) await refresh(hub) // a refresh already running sends it the whole when it ends
    if (sub.version < 0 && hub.version >= 0) deliver(sub, fullMessage(hub, new Date().toISOString()), hub.version)
  }
  catch (e) {
    leave()
    throw e
  }
  return leave
}
