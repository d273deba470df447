import { spawn } from 'node:child_process'
import { writeFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { inject } from 'vitest'

/** Runs one of Debian's PDF tools (poppler's pdfsig, qpdf) on bytes written to a file of the test run. */
export async function pdfTool(tool: 'pdfsig' | 'qpdf', args: string[], bytes: Uint8Array, name: string) {
  const file = resolve(inject('dataDir'), name)
  writeFileSync(file, bytes)
  return new Promise<{ code: number | null, out: string }>((done, fail) => {
    const p = spawn(tool, [...args, file])
    let out = ''
    p.stdout.on('data', (c: Buffer) => (out += c.toString('utf8')))
    p.stderr.on('data', (c: Buffer) => (out += c.toString('utf8')))
    p.on('error', fail)
    p.on('close', code => done({ code, out }))
  })
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
