import Dexie, { type EntityTable } from 'dexie'

/** What a queued write is: where it shows on the sheet, and what resolving a conflict can do with it. */
export type QueuedKind = 'run' | 'reading' | 'correction' | 'weather'

/**
 * A write the run sheet made, kept in the browser (IndexedDB) until the server has it. Its key goes with
 * every send as the Idempotency-Key, so a resend never writes twice. A url may name a run queued before it
 * as `{run:KEY}`, replaced by the run's id once that run is written.
 */
export interface QueuedWrite {
  seq?: number
  eventId: string
  key: string
  kind: QueuedKind
  label: string
  url: string
  body: Record<string, unknown>
  state: 'waiting' | 'conflict'
  message: string
  createdAt: number
  /** A reading or correction: its run (an id, or `{run:KEY}`), trap, system and the time typed. */
  cell?: { run: string, trapId: number, systemId: number, time: string }
  /** A new run: what the sheet shows of it until it is written. */
  run?: { entryId: number, direction: string, startedAt: string }
}

type OutboxDb = Dexie & {
  writes: EntityTable<QueuedWrite, 'seq'>
  runIds: EntityTable<{ key: string, id: number }, 'key'>
}

let db: OutboxDb | null = null

/** The browser's queue of writes (created on first use; never on the server). */
export function outboxDb(): OutboxDb {
  if (!db) {
    db = new Dexie('trapline-outbox') as OutboxDb
    db.version(1).stores({ writes: '++seq, eventId', runIds: 'key' })
  }
  return db
}

/** The placeholder for a run queued offline, until it has its id. */
export const pendingRunRef = (key: string) => `{run:${key}}`
