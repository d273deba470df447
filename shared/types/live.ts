/** What a stream of live results sends: the whole, what changed since `from`, or the server's clock. */
export type LiveMessage
  = | { kind: 'full', version: number, now: string, attempts: { id: number }[] }
    | { kind: 'delta', from: number, version: number, now: string, order: number[], changed: { id: number }[] }
    | { kind: 'tick', now: string }
