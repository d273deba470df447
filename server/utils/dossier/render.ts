import { promisify } from 'node:util'
import { deflate, deflateSync } from 'node:zlib'
import { PDFDocument } from 'pdf-lib'
import { embedDossierFonts } from './fonts'
import { attachmentName } from './pdf-attachments'
import { PdfLayout } from './pdf-layout'
import type { Manifest } from './manifest'
import { renderComputation, renderCover, renderTimingSheet, type SealFacts } from './sections-result'
import {
  renderCautions,
  renderCorrections,
  renderCourse,
  renderEvidence,
  renderInspection,
  renderSeal,
  renderStatements,
  renderWeather,
} from './sections-record'

const deflateAsync = promisify(deflate)

/** An evidence file that travels inside the dossier PDF. */
export interface Attachment { name: string, bytes: Uint8Array, mediaType: string, sha256: string, kind?: string }

/** The PDF: every section of the file, the manifest and its seal attached, small evidence files inside. */
export async function renderDossier(m: Manifest, seal: SealFacts, attach: Attachment[]) {
  const issued = new Date(m.dossier.issuedAt)
  const doc = await createDossierDocument(m, issued)
  const footer = `${m.event.name} · attempt #${m.dossier.attempt} · dossier version ${m.dossier.version}`
    + ` · sealed ${m.dossier.issuedAt.slice(0, 10)}`
  const L = new PdfLayout(doc, await embedDossierFonts(doc), footer)
  renderCover(L, m, seal)
  renderComputation(L, m)
  renderTimingSheet(L, m)
  renderCourse(L, m)
  renderInspection(L, m)
  renderWeather(L, m)
  renderStatements(L, m)
  renderEvidence(L, m, new Set(attach.map(a => a.sha256)))
  renderCorrections(L, m)
  renderCautions(L)
  await renderSeal(L, doc, seal)
  L.finish()
  await attachFiles(doc, m, seal, attach, issued)
  // The PDF signature's dictionary, filled in once the file is written (see `signPdf`).
  addSignaturePlaceholder(doc, {
    reason: `Sealed dossier version ${m.dossier.version} of attempt #${m.dossier.attempt}; key ${seal.fingerprint}`,
    name: 'Trapline dossier seal',
    location: m.event.venue ?? '',
  })
  // The evidence files are deflated on libuv's threads first, and the file is written a few objects per
  // tick: sealing a dossier with megabytes inside leaves the server answering other requests meanwhile.
  useNativeDeflate(doc, await predeflate(attach.map(a => a.bytes)))
  return doc.save({ useObjectStreams: false, objectsPerTick: 25 })
}

/** Each buffer deflated off the event loop (zlib on the thread pool), keyed by the buffer itself. */
async function predeflate(buffers: Uint8Array[]) {
  const done = new Map<Uint8Array, Uint8Array>()
  for (const b of buffers) done.set(b, await deflateAsync(b))
  return done
}

async function createDossierDocument(m: Manifest, issued: Date) {
  const doc = await PDFDocument.create()
  doc.setTitle(`Trapline dossier: ${m.entry.machine.name}, attempt ${m.dossier.attempt}, version ${m.dossier.version}`)
  doc.setAuthor('Trapline')
  doc.setProducer('Trapline')
  doc.setCreator('Trapline')
  doc.setCreationDate(issued)
  doc.setModificationDate(issued)
  return doc
}

/** The manifest, its seal and the small evidence files, as files attached to the PDF. */
async function attachFiles(doc: PDFDocument, m: Manifest, seal: SealFacts, attach: Attachment[], issued: Date) {
  const when = { creationDate: issued, modificationDate: issued }
  await doc.attach(new TextEncoder().encode(canonicalJson(m)), 'manifest.json', {
    mimeType: 'application/json',
    description: 'Canonical manifest',
    ...when,
  })
  await doc.attach(new TextEncoder().encode(`${seal.signature}\n`), 'manifest.sig', {
    mimeType: 'text/plain',
    description: `Ed25519 seal of the manifest SHA-256; key ${seal.fingerprint}`,
    ...when,
  })
  for (const a of attach) {
    await doc.attach(a.bytes, attachmentName(a.sha256, a.name), {
      mimeType: a.mediaType,
      description: `SHA-256 ${a.sha256}`,
      ...when,
    })
  }
}

/**
 * Attached files are compressed when the PDF is saved; Node's native zlib does in a fraction of a
 * second what pdf-lib's JavaScript deflate takes seconds for on 20 MB. Same Flate stream format.
 */
function useNativeDeflate(doc: PDFDocument, ready = new Map<Uint8Array, Uint8Array>()) {
  const context = doc.context as unknown as {
    flateStream: (c: Uint8Array, d?: object) => unknown
    stream: (c: Uint8Array, d: object) => unknown
  }
  context.flateStream = (contents, dict = {}) =>
    context.stream(ready.get(contents) ?? deflateSync(contents), { ...dict, Filter: 'FlateDecode' })
}
