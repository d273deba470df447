import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, describe, expect, it } from 'vitest'
import { PDFDocument } from 'pdf-lib'
import { addSignaturePlaceholder, checkPdfSignature, signPdf } from '../../server/utils/signing/pdf-signature'
import { createKeySet } from '../../server/utils/signing/seal-keys'

const dir = mkdtempSync(join(tmpdir(), 'trapline-sig-'))
afterAll(() => rmSync(dir, { recursive: true, force: true }))
const keys = createKeySet(join(dir, 'seal'), join(dir, 'authority'))

async function signed(reason: string) {
  const doc = await PDFDocument.create()
  doc.addPage([200, 200])
  addSignaturePlaceholder(doc, { reason, name: 'test', location: 'test' })
  const pdf = await doc.save({ useObjectStreams: false })
  return signPdf(pdf, [keys.certificatePem, ...keys.chainPem], keys.certificateKey)
}

/** The CMS's last byte: the last octet of the RSA signature, which is 0x00 once in 256 signatures. */
function lastCmsByte(pdf: Uint8Array) {
  const hex = /\/Contents\s*<([0-9a-fA-F]+)>/.exec(Buffer.from(pdf).toString('latin1'))![1]!
  const bytes = Buffer.from(hex, 'hex')
  const length = 2 + (bytes[1]! & 0x7f) + bytes.readUIntBE(2, bytes[1]! & 0x7f) // a long-form DER length
  return bytes[length - 1]
}

describe('the PDF signature (ISO 32000-1 12.8: /Contents is the DER-encoded CMS, zero-padded to its room)', () => {
  it('reads a signature whose last byte is zero, which the padding must not swallow', async () => {
    let pdf: Uint8Array | null = null
    // PKCS#1 v1.5 signatures are deterministic: the reason changes the signed digest until one ends in 0x00.
    for (let i = 0; i < 4000 && !pdf; i++) {
      const candidate = await signed(`run ${i}`)
      if (lastCmsByte(candidate) === 0) pdf = candidate
    }
    expect(pdf).not.toBeNull()
    const check = checkPdfSignature(pdf!)
    expect(check.problem).toBeNull()
    expect(check.valid).toBe(true)
  }, 120_000)

  it('still finds a changed byte in a signed file', async () => {
    const pdf = Buffer.from(await signed('changed'))
    const at = Buffer.from(pdf).indexOf('/MediaBox')
    pdf[at + 1] = 'N'.charCodeAt(0)
    expect(checkPdfSignature(pdf).problem).toBe('the file was changed after it was signed')
  })
})
