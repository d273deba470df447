import pg from 'pg'

// One PostgreSQL connection per app server LISTENs on the channel the events table's trigger announces
// each new live version on (migration 0022), so a reading written through any server reaches the
// streams held open by every server. Opened with the first subscriber, closed with the last.
const CHANNEL = 'trapline_live'
const RECONNECT_MS = 1000

type OnVersion = (version: number) => void
const subscribers = new Map<number, Set<OnVersion>>()
let client: pg.Client | null = null
let opening: Promise<void> | null = null
let retry: ReturnType<typeof setTimeout> | undefined
let closed = false

function announce(eventId: number, version: number) {
  for (const fn of subscribers.get(eventId) ?? []) fn(version)
}

async function open() {
  const c = new pg.Client({ connectionString: useRuntimeConfig().databaseUrl })
  c.on('notification', (msg) => {
    const [eventId, version] = (msg.payload ?? '').split(':').map(Number)
    if (Number.isInteger(eventId) && Number.isInteger(version)) announce(eventId!, version!)
  })
  c.on('error', () => dropped(c))
  c.on('end', () => dropped(c))
  await c.connect()
  await c.query(`LISTEN ${CHANNEL}`)
  if (!subscribers.size || closed) return void c.end().catch(() => {})
  client = c
}

/** A lost connection is opened again; every event is then told to look, since notices may have been missed. */
function dropped(c: pg.Client) {
  if (client !== c) return
  client = null
  c.end().catch(() => {})
  scheduleReconnect()
}

function scheduleReconnect() {
  if (closed || retry || !subscribers.size) return
  retry = setTimeout(() => {
    retry = undefined
    ensureListening().then(
      () => { for (const id of subscribers.keys()) announce(id, -1) },
      () => scheduleReconnect(),
    )
  }, RECONNECT_MS)
}

function ensureListening(): Promise<void> {
  if (client) return Promise.resolve()
  opening ??= open().finally(() => {
    opening = null
  })
  return opening
}

/**
 * Calls `fn` with each new version of the event's live results (or -1 after a lost connection: look
 * again). Returns the function that stops it.
 */
export async function listenLiveVersions(eventId: number, fn: OnVersion): Promise<() => void> {
  closed = false
  const set = subscribers.get(eventId) ?? new Set()
  set.add(fn)
  subscribers.set(eventId, set)
  await ensureListening().catch(() => scheduleReconnect())
  return () => {
    set.delete(fn)
    if (!set.size) subscribers.delete(eventId)
    if (!subscribers.size) stopListening()
  }
}

/** Closes the listening connection (the last subscriber left, or the server stops). */
export function stopListening(forGood = false) {
  closed = forGood
  clearTimeout(retry)
  retry = undefined
  const c = client
  client = null
  c?.end().catch(() => {})
}
