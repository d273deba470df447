import { cmp, fromDecimal } from './exact'

/** A ratified result as the record book reads it from its sealed dossier. */
export interface RatifiedResult<T = unknown> {
  attemptId: number
  /** The rule profile the record is kept under (records of different profiles never compare). */
  profile?: string
  className: string
  distanceLabel: string
  /** The result in km/h as published (the same exact value gives the mph figure). */
  kmh: string
  /** The event's local date of the result's runs. */
  date: string
  /** Whether the profile in force carries forward only the best result per class each day. */
  bestPerDayOnly: boolean
  /** Order of ratification; a later version of the same attempt's dossier replaces the earlier. */
  order: number
  extra: T
}

export interface RecordBook<T> {
  /**
   * The record per class and distance: the fastest carried-forward result; a tie never displaces the
   * holder. `history` lists the holders it displaced, the latest first, each with its own figure.
   */
  records: (RatifiedResult<T> & { history: RatifiedResult<T>[] })[]
  /** Ratified results that a best-per-day rule did not carry forward, with the one that was. */
  notCarriedForward: (RatifiedResult<T> & { bestOfDay: RatifiedResult<T> })[]
}

const key = (r: RatifiedResult<unknown>) => `${r.profile ?? ''}\u0000${r.className}\u0000${r.distanceLabel}`
/** One claim: an attempt's result over one distance (one pass may claim several distances). */
const claim = (r: RatifiedResult<unknown>) => `${r.attemptId}\u0000${r.distanceLabel}`
const faster = (a: RatifiedResult<unknown>, b: RatifiedResult<unknown>) =>
  cmp(fromDecimal(a.kmh), fromDecimal(b.kmh)) > 0

/**
 * The record book from the ratified results: one result per attempt and distance (its latest ratified version);
 * where the profile says so, only the best per class, distance and day goes forward; then the
 * fastest per class and distance stands, the earlier holder keeping it on a tie.
 */
export function buildRecordBook<T>(ratified: RatifiedResult<T>[]): RecordBook<T> {
  const byClaim = new Map<string, RatifiedResult<T>>()
  for (const r of [...ratified].sort((a, b) => a.order - b.order)) byClaim.set(claim(r), r)
  const results = [...byClaim.values()].sort((a, b) => a.order - b.order)
  const bestOfDay = new Map<string, RatifiedResult<T>>()
  for (const r of results) {
    const day = `${key(r)}\u0000${r.date}`
    const best = bestOfDay.get(day)
    if (!best || faster(r, best)) bestOfDay.set(day, r)
  }
  const notCarriedForward: RecordBook<T>['notCarriedForward'] = []
  // The successive holders of each class and distance, the first holder first.
  const holders = new Map<string, RatifiedResult<T>[]>()
  for (const r of results) {
    const best = bestOfDay.get(`${key(r)}\u0000${r.date}`)!
    if (r.bestPerDayOnly && best !== r) {
      notCarriedForward.push({ ...r, bestOfDay: best })
      continue
    }
    const chain = holders.get(key(r)) ?? []
    const holder = chain.at(-1)
    if (!holder || faster(r, holder)) holders.set(key(r), [...chain, r])
  }
  const records = [...holders.values()]
    .map(chain => ({ ...chain.at(-1)!, history: chain.slice(0, -1).reverse() }))
    .sort((a, b) => (a.profile ?? '').localeCompare(b.profile ?? '') || a.className.localeCompare(b.className)
      || a.distanceLabel.localeCompare(b.distanceLabel))
  return { records, notCarriedForward }
}
