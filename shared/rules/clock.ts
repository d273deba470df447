/**
 * How far a device's clock is from the server's, from one request: the device's clock when it sent the
 * request and when the answer came, and the server's clock in the answer. With the server's stamp taken
 * between the two, the offset is θ = S − (T1 + T4) / 2, within ± half the round trip (the clock offset of
 * RFC 5905, section 8, with the server's receive and transmit stamps equal).
 */
export function clockOffset(m: { sentMs: number, receivedMs: number, serverMs: number }) {
  if (m.receivedMs < m.sentMs) throw new RangeError('the answer came before the request was sent')
  return {
    /** Positive when the server's clock is ahead of the device's. */
    offsetMs: Math.round(m.serverMs - (m.sentMs + m.receivedMs) / 2),
    uncertaintyMs: Math.ceil((m.receivedMs - m.sentMs) / 2),
  }
}

/**
 * A device clock further than this from the server's is shown as a warning on the timekeeper's page: typed
 * start times and times of day are read against the server's clock (the field day's issue asks for 2 s;
 * common practice of timing huts: clocks set to the second before the day starts).
 */
export const CLOCK_WARN_MS = 2000

/** Whether the offset is beyond the warning even at the edge of its uncertainty. */
export const clockOff = (o: { offsetMs: number, uncertaintyMs: number }) =>
  Math.abs(o.offsetMs) - o.uncertaintyMs > CLOCK_WARN_MS
