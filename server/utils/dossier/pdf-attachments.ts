import { inflateSync } from 'node:zlib'
import {
  PDFArray,
  PDFDict,
  PDFDocument,
  PDFHexString,
  PDFName,
  PDFRawStream,
  PDFString,
} from 'pdf-lib'

/** How far one attached file may inflate, and all of them together: a dossier carries a few MB. */
export const ATTACHMENT_INFLATE_LIMIT = 64 * 1024 * 1024
export const ATTACHMENTS_TOTAL_LIMIT = 128 * 1024 * 1024

export class AttachmentTooLarge extends Error {}

/** The name of an evidence file attached inside a dossier: unique by its hash, readable by its name. */
export const attachmentName = (sha: string, name: string) => `${sha.slice(0, 12)}-${name}`

/**
 * An attached file's bytes: stored as is, or deflated (the only filter a dossier uses), inflated
 * with a ceiling so that a small file cannot unpack into gigabytes.
 */
function decodeAttachment(stream: PDFRawStream, room: number): Uint8Array {
  const filter = stream.dict.lookup(PDFName.of('Filter'))
  const limit = Math.min(ATTACHMENT_INFLATE_LIMIT, room)
  if (filter === undefined) {
    if (stream.contents.length > limit) throw new AttachmentTooLarge()
    return stream.contents
  }
  // Any other filter is not one a dossier uses: read as nothing, so it cannot match what was sealed.
  if (filter !== PDFName.of('FlateDecode')) return new Uint8Array()
  try {
    return inflateSync(stream.contents, { maxOutputLength: limit })
  }
  catch (e) {
    const tooLarge = (e as { code?: string }).code === 'ERR_BUFFER_TOO_LARGE' || e instanceof RangeError
    throw tooLarge ? new AttachmentTooLarge() : e
  }
}

/** The files attached to a PDF (its EmbeddedFiles name tree), decoded. Throws if it is not a readable PDF. */
export async function readAttachments(bytes: Uint8Array): Promise<{ name: string, data: Uint8Array }[]> {
  const doc = await PDFDocument.load(bytes, { updateMetadata: false, throwOnInvalidObject: true })
  const out: { name: string, data: Uint8Array }[] = []
  let room = ATTACHMENTS_TOTAL_LIMIT
  const tree = doc.catalog
    .lookupMaybe(PDFName.of('Names'), PDFDict)
    ?.lookupMaybe(PDFName.of('EmbeddedFiles'), PDFDict)
  const walk = (node: PDFDict | undefined) => {
    if (!node) return
    const names = node.lookupMaybe(PDFName.of('Names'), PDFArray)
    for (let i = 0; names && i + 1 < names.size(); i += 2) {
      const key = names.lookup(i)
      const name = key instanceof PDFString || key instanceof PDFHexString ? key.decodeText() : String(key)
      const spec = names.lookup(i + 1, PDFDict)
      const stream = spec.lookup(PDFName.of('EF'), PDFDict).lookup(PDFName.of('F'))
      const data = stream instanceof PDFRawStream ? decodeAttachment(stream, room) : new Uint8Array()
      room -= data.length
      out.push({ name, data })
    }
    const kids = node.lookupMaybe(PDFName.of('Kids'), PDFArray)
    for (let i = 0; kids && i < kids.size(); i++) walk(kids.lookup(i, PDFDict))
  }
  walk(tree)
  return out
}
