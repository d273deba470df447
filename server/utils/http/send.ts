import type { Readable } from 'node:stream'
import type { H3Event } from 'h3'

/**
 * Sends a stored file; a download the client cancels closes the file (or the object store's socket)
 * at once instead of leaving it open until collected.
 */
export function sendStored(event: H3Event, stream: Readable) {
  event.node.res.once('close', () => stream.destroy())
  return sendStream(event, stream)
}
