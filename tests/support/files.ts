import { createHash } from 'node:crypto'

// Small files of known types, made here: a PDF by its published header, a PNG from its spec.
export const sha256 = (b: Uint8Array) => createHash('sha256').update(b).digest('hex')

/** A minimal PDF 1.4 (ISO 32000 file structure: header, one page, xref, trailer). */
export function pdf(text = 'survey'): Buffer {
  const body = `%PDF-1.4\n1 0 obj<</Type/Catalog/Pages 2 0 R>>endobj\n2 0 obj<</Type/Pages/Kids[3 0 R]/Count 1>>endobj\n3 0 obj<</Type/Page/Parent 2 0 R/MediaBox[0 0 200 200]>>endobj\n% ${text}\ntrailer<</Root 1 0 R>>\n%%EOF\n`
  return Buffer.from(body)
}

/** A 1×1 PNG (signature, IHDR, IDAT, IEND; PNG specification, ISO/IEC 15948). */
export const png = Buffer.from('iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mP8z8BQDwAEhQGAhKmMIQAAAABJRU5ErkJggg==', 'base64')

export function form(fields: Record<string, string | number>, file?: { name: string, bytes: Uint8Array, type?: string }, fileFirst = false) {
  const f = new FormData()
  const addFile = () => file && f.append('file', new Blob([file.bytes], { type: file.type ?? 'application/octet-stream' }), file.name)
  if (fileFirst) addFile()
  for (const [k, v] of Object.entries(fields)) f.append(k, String(v))
  if (!fileFirst) addFile()
  return f
}
