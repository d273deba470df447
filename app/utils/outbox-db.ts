import type { Dexie, EntityTable } from 'dexie'

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
  /** A refusal that names the time standing now in the cell (its reading's id), for a correction of it. */
  standingId?: number
  /** A new run: what the sheet shows of it until it is written. */
  run?: { entryId: number, direction: string, startedAt: string }
}

type OutboxDb = Dexie & {
  writes: EntityTable<QueuedWrite, 'seq'>
  runIds: EntityTable<{ key: string, id: number }, 'key'>
}

const NAME = 'trapline-outbox'
let db: Promise<OutboxDb> | null = null

/**
 * The browser's queue of writes (never on the server). Dexie is loaded on first use only: a device that
 * never lost its link never downloads it.
 */
export function outboxDb(): Promise<OutboxDb> {
  db ??= import('dexie').then(({ default: Dexie }) => {
    const d = new Dexie(NAME) as OutboxDb
    d.version(1).stores({ writes: '++seq, eventId', runIds: 'key' })
    return d
  })
  return db
}

/** Whether this browser ever kept a write (without loading Dexie to find out). */
export async function outboxExists() {
  if (db) return true
  const list = await indexedDB.databases?.().catch(() => null)
  return !list || list.some(d => d.name === NAME)
}

/** The placeholder for a run queued offline, until it has its id. */
export const pendingRunRef = (key: string) => `{run:${key}}`
