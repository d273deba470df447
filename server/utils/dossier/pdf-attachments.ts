import {
  decodePDFRawStream,
  PDFArray,
  PDFDict,
  PDFDocument,
  PDFHexString,
  PDFName,
  PDFRawStream,
  PDFString,
} from 'pdf-lib'

/** The files attached to a PDF (its EmbeddedFiles name tree), decoded. Throws if it is not a readable PDF. */
export async function readAttachments(bytes: Uint8Array): Promise<{ name: string, data: Uint8Array }[]> {
  const doc = await PDFDocument.load(bytes, { updateMetadata: false, throwOnInvalidObject: true })
  const out: { name: string, data: Uint8Array }[] = []
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
      out.push({
        name,
        data: stream instanceof PDFRawStream ? decodePDFRawStream(stream).decode() : new Uint8Array(),
      })
    }
    const kids = node.lookupMaybe(PDFName.of('Kids'), PDFArray)
    for (let i = 0; kids && i < kids.size(); i++) walk(kids.lookup(i, PDFDict))
  }
  walk(tree)
  return out
}
