import { spawn } from 'node:child_process'
import { writeFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { inject } from 'vitest'

/** Runs one of Debian's PDF tools (poppler's pdfsig, qpdf) on bytes written to a file of the test run. */
export async function pdfTool(tool: 'pdfsig' | 'qpdf' | 'pdftotext', args: string[], bytes: Uint8Array, name: string) {
  const file = resolve(inject('dataDir'), name)
  writeFileSync(file, bytes)
  return new Promise<{ code: number | null, out: string }>((done, fail) => {
    const p = spawn(tool, [...args, file, ...(tool === 'pdftotext' ? ['-'] : [])])
    let out = ''
    p.stdout.on('data', (c: Buffer) => (out += c.toString('utf8')))
    p.stderr.on('data', (c: Buffer) => (out += c.toString('utf8')))
    p.on('error', fail)
    p.on('close', code => done({ code, out }))
  })
}

/** The text of a PDF as poppler's pdftotext reads it (UTF-8), whitespace folded; throws if it fails. */
export async function pdfText(bytes: Uint8Array, name: string) {
  const r = await pdfTool('pdftotext', ['-enc', 'UTF-8'], bytes, name)
  if (r.code !== 0) throw new Error(`pdftotext exited ${r.code}: ${r.out}`)
  return r.out.replace(/\s+/g, ' ')
}

/** The same bytes with one byte flipped inside the first page's content stream. */
export function flipInFirstPage(pdf: Uint8Array, pageContentsObject: number) {
  const bytes = new Uint8Array(pdf)
  const text = Buffer.from(bytes).toString('latin1')
  const obj = text.indexOf(`\n${pageContentsObject} 0 obj`)
  const start = text.indexOf('stream', obj) + 'stream\n'.length
  bytes[start + 20] ^= 0x01
  return bytes
}
