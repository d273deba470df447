import { spawn } from 'node:child_process'
import { writeFileSync } from 'node:fs'
import { connect } from 'node:net'
import { createPublicKey, verify as cryptoVerify } from 'node:crypto'
import { resolve } from 'node:path'
import Papa from 'papaparse'
import pg from 'pg'
import type { PDFHexString, PDFString } from 'pdf-lib'
import { PDFArray, PDFDict, PDFDocument, PDFName } from 'pdf-lib'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { readAttachments } from '../../server/utils/dossier/pdf-attachments'
import { call, DEMO_PASSWORD, demoEmail, demoEventId, demoMileRecord, login, mailTo, url, useTestServer } from '../support/api'
import { sha256 } from '../support/files'
import { flipInFirstPage, pdfText, pdfTool } from '../support/pdf-tools'
import { pairSpeed, speedOver, timesOver } from '../support/hand'
import { readyPair } from '../support/ready-attempt'
import { newTestEvent, type TestEvent } from '../support/test-event'

await useTestServer()
const db = new pg.Client({ connectionString: inject('databaseUrl') })
await db.connect()
afterAll(() => db.end())

const cookie = {} as Record<'organiser' | 'team' | 'team2' | 'official', string>
let eventId = 0
let pdf: Uint8Array
let dossierId = 0

const verify = async (bytes: Uint8Array, name = 'dossier.pdf') => {
  const body = new FormData()
  body.append('file', new Blob([bytes], { type: 'application/pdf' }), name)
  const r = await fetch(url('/api/dossiers/verify'), { method: 'POST', body })
  return { status: r.status, body: await r.json() as { sealValid: boolean, keyFingerprint: string | null, items: { name: string, ok: boolean }[], message: string, standing: any } }
}

/** Replaces one attached file of a PDF by the same bytes with one byte changed, through pdf-lib. */
async function tamperAttachment(bytes: Uint8Array, name: string) {
  const doc = await PDFDocument.load(bytes, { updateMetadata: false })
  const names = doc.catalog.lookup(PDFName.of('Names'), PDFDict).lookup(PDFName.of('EmbeddedFiles'), PDFDict).lookup(PDFName.of('Names'), PDFArray)
  const files = await readAttachments(bytes)
  for (let i = 0; i < names.size(); i += 2) {
    const key = names.lookup(i) as PDFString | PDFHexString
    if (key.decodeText() !== name) continue
    const data = new Uint8Array(files.find(f => f.name === name)!.data)
    data[Math.floor(data.length / 2)] ^= 0x01
    const ef = names.lookup(i + 1, PDFDict).lookup(PDFName.of('EF'), PDFDict)
    ef.set(PDFName.of('F'), doc.context.register(doc.context.flateStream(data, { Type: 'EmbeddedFile' })))
  }
  return doc.save({ useObjectStreams: false })
}

beforeAll(async () => {
  cookie.organiser = await login(demoEmail('organiser'))
  cookie.official = await login(demoEmail('official'))
  cookie.team = await login('team@trapline.test')
  cookie.team2 = await login('team2@trapline.test')
  eventId = await demoEventId(cookie.organiser)
  const record = await demoMileRecord()
  // The officials' copy, as a person of the event reads it (the site address of the test server).
  const r = await fetch(record.dossierUrl, { headers: { cookie: cookie.organiser } })
  pdf = new Uint8Array(await r.arrayBuffer())
  dossierId = Number(/dossiers\/(\d+)\/pdf/.exec(record.dossierUrl)![1])
})

describe('the demo\'s ratified dossier', () => {
  it('is in the public record book and downloads without sign-in', async () => {
    const record = await demoMileRecord()
    expect(record).toMatchObject({ class: 'Electric, fully streamlined', distance: 'Flying mile' })
    // The record is the pair computed by hand from the stored trap times of the primary system.
    const attemptId = (await db.query('select attempt_id from dossiers where id = $1', [dossierId])).rows[0].attempt_id
    const sheet = (await call('GET', `/api/events/${eventId}/run-sheet`, { cookie: cookie.organiser })).body
    const setup = (await call('GET', `/api/events/${eventId}/setup`, { cookie: cookie.organiser })).body
    const trap = (label: string) => setup.courses.flatMap((c: any) => c.traps).find((t: any) => t.label === label).id
    const primary = setup.systems.find((s: any) => s.role === 'primary').id
    const runs = sheet.attempts.find((a: any) => a.id === attemptId).runs
    const [t1, t2] = timesOver(runs, trap('M-in'), trap('M-out'), primary)
    const byHand = pairSpeed('1609.344', t1!, t2!)
    expect(record).toMatchObject({ speedKmh: byHand.kmh, speedMph: byHand.mph })
    expect(Buffer.from(pdf.subarray(0, 5)).toString()).toBe('%PDF-')
  })

  it('prints every figure of the pair as the database gives it, read back with poppler\'s pdftotext', async () => {
    // The text of the sealed PDF (Debian's poppler-utils, a reader independent of the product), whitespace folded.
    const text = await pdfText(pdf, `dossier-${dossierId}.pdf`)
    const attemptId = (await db.query('select attempt_id from dossiers where id = $1', [dossierId])).rows[0].attempt_id
    const sheet = (await call('GET', `/api/events/${eventId}/run-sheet`, { cookie: cookie.organiser })).body
    const setup = (await call('GET', `/api/events/${eventId}/setup`, { cookie: cookie.organiser })).body
    const trap = (label: string) => setup.courses.flatMap((c: any) => c.traps).find((t: any) => t.label === label).id
    const primary = setup.systems.find((x: any) => x.role === 'primary').id
    const runs = sheet.attempts.find((a: any) => a.id === attemptId).runs
    const [t1, t2] = timesOver(runs, trap('M-in'), trap('M-out'), primary)
    // Each run: its time over the mile and its speed, d / t, by hand (mathjs), truncated (common practice).
    for (const t of [t1!, t2!]) {
      const v = speedOver('1609.344', t)
      expect(text).toContain(`= 1609.344 m / ${t.toFixed(4)} s = ${v.kmh} km/h = ${v.mph} mph`)
    }
    // The pair by the profile's averaging (mean of times): the mean time, and the distance over it.
    const mean = t1!.add(t2!).div(2)
    const pair = pairSpeed('1609.344', t1!, t2!)
    expect(text).toContain(`Mean time = (t1 + t2) / 2 = ${mean.toFixed(5)} s`)
    expect(text).toContain(`= ${pair.kmh} km/h = ${pair.mph} mph`)
    // Each signature says how it was made: the demo's people signed with their password again.
    expect(text).toContain('password re-entered, the weaker kind')
    expect(text).toContain(`${pair.kmh} km/h`)
    // The record it was measured against, in the unit it was published in (the demo book's invented 239.227 mph).
    expect(text).toContain('239.227 mph; beaten')
    const [{ name }] = (await db.query('select name from events where id = $1', [eventId])).rows
    expect(text).toContain(name)
  })

  it('became the standing record from its ratification on; the pair before it is measured against the old one', async () => {
    const setup = (await call('GET', `/api/events/${eventId}/setup`, { cookie: cookie.organiser })).body
    const rows = setup.records.filter((r: any) => r.className === 'Electric, fully streamlined' && r.distanceLabel === 'Flying mile')
    // The demo's first dossier of the streamliner's pair, ratified by the seed.
    const [first] = (await db.query(`select d.id, d.attempt_id from dossiers d join decisions x on x.dossier_id = d.id
      where x.decision = 'ratified' order by d.id limit 1`)).rows
    const row = rows.find((r: any) => r.dossierId === first.id)
    const sheet = (await call('GET', `/api/events/${eventId}/run-sheet`, { cookie: cookie.organiser })).body
    const trap = (label: string) => setup.courses.flatMap((c: any) => c.traps).find((t: any) => t.label === label).id
    const primary = setup.systems.find((x: any) => x.role === 'primary').id
    const [t1, t2] = timesOver(sheet.attempts.find((a: any) => a.id === first.attempt_id).runs, trap('M-in'), trap('M-out'), primary)
    // Kept in the unit the class's record was published in (mph), at its published decimals.
    expect(row).toMatchObject({ speed: pairSpeed('1609.344', t1!, t2!).mph, unit: 'mph' })
    expect(row.setAt).not.toBeNull()
    // The book's hand-entered record (239.227 mph, invented for the demo) still stands for the pair run before it.
    const live = (await call('GET', `/api/events/${eventId}/live`, { cookie: cookie.team })).body
    expect(live.find((a: any) => a.id === first.attempt_id).standingRecord).toEqual({ speed: '239.227', unit: 'mph', minimum: false })
    // Each ratified row is faster than every record that stood before it: a tie never displaces the holder.
    const ratified = rows.filter((r: any) => r.dossierId).sort((a: any, b: any) => a.setAt.localeCompare(b.setAt))
    for (const r of ratified) {
      const before = rows.filter((x: any) => !x.setAt || x.setAt < r.setAt)
      // Compared in m/s: a mile is 1609.344 m and an hour 3600 s (NIST SP 811, appendix B).
      const ms = (x: any) => Number(x.speed) * (x.unit === 'mph' ? 0.44704 : 1 / 3.6)
      expect(before.every((x: any) => ms(x) < ms(r))).toBe(true)
    }
  })

  it('read back with pdf-lib, carries the manifest, its seal and the small evidence files exactly as stored', async () => {
    const [row] = (await db.query('select * from dossiers where id = $1', [dossierId])).rows
    expect(sha256(pdf)).toBe(row.pdf_sha256)
    const files = await readAttachments(pdf)
    const manifest = JSON.parse(new TextDecoder().decode(files.find(f => f.name === 'manifest.json')!.data))
    expect(manifest).toEqual(row.manifest)
    expect(sha256(files.find(f => f.name === 'manifest.json')!.data)).toBe(row.manifest_sha256)
    // The seal checks with Node's own Ed25519 and the published key, over the SHA-256 of manifest.json as attached.
    const seal = Buffer.from(new TextDecoder().decode(files.find(f => f.name === 'manifest.sig')!.data).trim(), 'base64')
    const key = createPublicKey((await call('GET', '/api/seal')).body.publicKeyPem)
    const digest = Buffer.from(sha256(files.find(f => f.name === 'manifest.json')!.data), 'hex')
    expect(cryptoVerify(null, digest, key, seal)).toBe(true)
    expect(cryptoVerify(null, Buffer.from(sha256(Buffer.from('another manifest')), 'hex'), key, seal)).toBe(false)
    const evidence = (await db.query('select original_name, sha256 from evidence where event_id = $1', [eventId])).rows
    for (const e of manifest.evidence) {
      expect(evidence.some((x: any) => x.sha256 === e.sha256)).toBe(true)
      const attached = files.find(f => f.name.endsWith(e.name) && f.name.startsWith(e.sha256.slice(0, 12)))
      expect(attached && sha256(attached.data)).toBe(e.sha256)
    }
    expect(manifest.statements.filter((s: any) => !s.withdraws)).toHaveLength(2)
  })

  it('has a public copy for everyone, sealed the same way, without the licence number or its scan', async () => {
    const record = await demoMileRecord()
    const open = new Uint8Array(await (await fetch(record.dossierUrl)).arrayBuffer()) // no sign-in
    const [row] = (await db.query('select * from dossiers where id = $1', [dossierId])).rows
    expect(sha256(open)).toBe(row.public_pdf_sha256)
    expect(sha256(open)).not.toBe(row.pdf_sha256)
    const files = await readAttachments(open)
    expect(files.some(f => f.name.endsWith('rider-licence.pdf'))).toBe(false)
    const manifest = JSON.parse(new TextDecoder().decode(files.find(f => f.name === 'manifest.json')!.data))
    expect(manifest.dossier.copy).toBe('public')
    expect(manifest.entry.rider.licenceNo).toBe('withheld in the public copy')
    expect(JSON.stringify(manifest)).not.toContain(row.manifest.entry.rider.licenceNo)
    expect(manifest.result).toEqual(row.manifest.result)
    const r = await verify(open)
    expect(r.body.sealValid, `${r.status} ${r.body.message} ${JSON.stringify(r.body.items)}`).toBe(true)
    expect(r.body.items.every(i => i.ok)).toBe(true)
    // Signed and well-formed too, for poppler's pdfsig and qpdf.
    expect((await pdfTool('pdfsig', [], open, 'public-copy.pdf')).out).toContain('Signature is Valid.')
    expect((await pdfTool('qpdf', ['--check'], open, 'public-copy-qpdf.pdf')).code).toBe(0)
  })

  it('verifies as issued', async () => {
    const r = await verify(pdf)
    expect(r.status).toBe(200)
    expect(r.body.sealValid).toBe(true)
    expect(r.body.keyFingerprint).toBe((await call('GET', '/api/seal')).body.fingerprint)
    expect(r.body.items.every(i => i.ok)).toBe(true)
  })
})

describe('the record holder\'s certificate', { shuffle: false }, () => {
  it('is one page, signed like the dossier, with the figure in both units as the record book has it', async () => {
    const record = (await call('GET', '/api/record-book')).body.records
      .find((r: any) => r.class === 'Electric, fully streamlined' && r.distance === 'Flying mile')
    const res = await fetch(record.certificateUrl) // public, no sign-in
    expect(res.status).toBe(200)
    const cert = new Uint8Array(await res.arrayBuffer())
    // Read back with pdf-lib: one page, titled with the class and distance it certifies.
    const doc = await PDFDocument.load(cert)
    expect(doc.getPageCount()).toBe(1)
    expect(doc.getTitle()).toBe(`Record certificate: ${record.class}, ${record.distance}`)
    expect((await pdfTool('pdfsig', [], cert, 'certificate.pdf')).out).toContain('Signature is Valid.')
    const text = await pdfText(cert, 'certificate-text.pdf')
    expect(text).toContain('Record certificate')
    expect(text).toContain(`${record.speedKmh} km/h = ${record.speedMph} mph`)
    for (const field of [record.class, record.distance, record.machine, record.rider, record.team, record.date])
      expect(text).toContain(field)
    expect(text).toContain('Ratified by')
  })

  it('an official enters the sanctioning body\'s homologation, signed; the book and the certificate show it', async () => {
    // The demo homologated the mile; its kilometre, ratified from the same pair, is not yet.
    const mile = async () => (await call('GET', '/api/record-book')).body.records
      .find((r: any) => r.class === 'Electric, fully streamlined' && r.distance === 'Flying kilometre')
    const before = await mile()
    expect(before.status).toBe('ratified')
    const id = Number(/dossiers\/(\d+)\/pdf/.exec(before.dossierUrl)![1])
    // An invented reference of the sanctioning body, for the test.
    const body = { reference: 'TEST-HOM-0001', homologatedOn: '2026-11-30', typedName: 'Oswin Oakes', password: DEMO_PASSWORD }
    expect((await call('POST', `/api/dossiers/${id}/homologation`, { cookie: cookie.team, body })).status).toBe(403)
    const done = await call('POST', `/api/dossiers/${id}/homologation`, { cookie: cookie.official, body })
    expect(done.status, JSON.stringify(done.body)).toBe(201)
    expect((await call('POST', `/api/dossiers/${id}/homologation`, { cookie: cookie.official, body })).status).toBe(409)
    const now = await mile()
    expect(now).toMatchObject({ status: 'homologated', homologation: { reference: 'TEST-HOM-0001', on: '2026-11-30' } })
    // Its history: the holders it displaced, each slower than the one after it (other tests may add some).
    const chain = [now, ...now.history]
    for (let i = 1; i < chain.length; i++) expect(Number(chain[i].speedKmh)).toBeLessThan(Number(chain[i - 1].speedKmh))
    const report = (await call('GET', `/api/signatures/${done.body.signatureId}`, { cookie: cookie.official })).body
    expect(report).toMatchObject({ kind: 'homologation', storedContentMatches: true, recordStillMatches: true })
    // The CSV export says the same, units in the headers (read back with papaparse, RFC 4180).
    const csv = Papa.parse<Record<string, string>>(await (await fetch(url('/api/record-book.csv'))).text(), { header: true }).data
    expect(csv.find(r => r['Dossier'] === now.dossierUrl)).toMatchObject({
      'Class': now.class, 'Speed (km/h)': now.speedKmh, 'Speed (mph)': now.speedMph, 'Holder': 'current',
      'Status': 'homologated', 'Homologation reference': 'TEST-HOM-0001',
    })
    const cert = new Uint8Array(await (await fetch(before.certificateUrl)).arrayBuffer())
    const text = await pdfText(cert, 'certificate-homologated.pdf')
    expect(text).toContain('reference TEST-HOM-0001, 2026-11-30')
  })
})

describe('a standard PDF signature that stands without Trapline', () => {
  // ISO 32000 signature dictionary, SubFilter ETSI.CAdES.detached (PAdES baseline), checked by poppler's
  // pdfsig and qpdf from Debian: tools independent of the product.
  it('poppler\'s pdfsig reports the issued file valid and qpdf finds no structural error', async () => {
    const sig = await pdfTool('pdfsig', [], pdf, 'signed.pdf')
    expect(sig.out).toContain('Signature Type: ETSI.CAdES.detached')
    expect(sig.out).toContain('Signature Validation: Signature is Valid.')
    expect(sig.out).toContain('Total document signed')
    const seal = (await call('GET', '/api/seal')).body
    expect(sig.out).toContain(`Trapline dossier seal ${seal.fingerprint.slice(0, 19)}`)
    const check = await pdfTool('qpdf', ['--check'], pdf, 'signed-qpdf.pdf')
    expect(check.code, check.out).toBe(0)
    expect(check.out).toContain('No syntax or stream encoding errors found')
  })

  it('a byte changed in a page, in the manifest or in an attached file makes pdfsig report it invalid', async () => {
    const doc = await PDFDocument.load(pdf, { updateMetadata: false })
    const contents = doc.getPages()[0]!.node.get(PDFName.of('Contents'))!.toString().split(' ')[0]
    const licence = (await readAttachments(pdf)).find(f => f.name.endsWith('rider-licence.pdf'))!.name
    const copies = {
      page: flipInFirstPage(pdf, Number(contents)),
      manifest: await tamperAttachment(pdf, 'manifest.json'),
      attachment: await tamperAttachment(pdf, licence),
    }
    for (const [what, bytes] of Object.entries(copies)) {
      const sig = await pdfTool('pdfsig', [], bytes, `changed-${what}.pdf`)
      expect(sig.out, what).not.toContain('Signature is Valid.')
      expect(sig.out, what).toMatch(/Signature is Invalid|Digest Mismatch|document not signed|signature not found/i)
      const r = await verify(bytes)
      expect(r.body.items.find(i => i.name === 'PDF signature')!.ok, what).toBe(false)
    }
  })
})

describe('tampering is caught and the failing part named', () => {
  it('one changed byte in the PDF body', async () => {
    const bytes = new Uint8Array(pdf)
    const text = Buffer.from(bytes).toString('latin1')
    const at = text.indexOf('/Title <') + '/Title <'.length + 10
    bytes[at] = bytes[at] === 0x30 ? 0x31 : 0x30
    const r = await verify(bytes)
    expect(r.body.sealValid).toBe(false)
    // The standard PDF signature covers every byte but its own: it fails with the file's hash.
    expect(r.body.items.filter(i => !i.ok).map(i => i.name)).toEqual(['PDF signature', 'PDF file as issued'])
    expect(r.body.message).toContain('PDF signature, PDF file as issued do not match')
  })

  it('one changed byte in an attached file', async () => {
    const files = await readAttachments(pdf)
    const target = files.find(f => f.name.endsWith('rider-licence.pdf'))!
    const r = await verify(await tamperAttachment(pdf, target.name))
    expect(r.body.sealValid).toBe(false)
    expect(r.body.items.filter(i => !i.ok).map(i => i.name)).toEqual(['rider-licence.pdf', 'PDF signature', 'PDF file as issued'])
    expect(r.body.keyFingerprint).not.toBeNull() // the manifest itself is intact
  })

  it('one changed byte in the manifest', async () => {
    const r = await verify(await tamperAttachment(pdf, 'manifest.json'))
    expect(r.body.sealValid).toBe(false)
    expect(r.body.keyFingerprint).toBeNull()
    expect(r.body.items.find(i => i.name === 'manifest.json')!.ok).toBe(false)
  })

  it.each([
    ['a truncated PDF', () => pdf.subarray(0, Math.floor(pdf.length / 3)), /truncated or damaged/],
    ['a file that is not a PDF', () => new TextEncoder().encode('hello, this is not a dossier'), /not a PDF/],
  ])('answers %s clearly, never with a 500', async (_what, make, message) => {
    const r = await verify(make())
    expect(r.status).toBe(422)
    expect(r.body.sealValid).toBe(false)
    expect(r.body.message).toMatch(message)
  })
})

describe('readiness', () => {
  it('refuses to build a dossier that is not ready, naming what is missing', async () => {
    const live = (await call('GET', `/api/events/${eventId}/live`, { cookie: cookie.organiser })).body
    // The second team's demo attempt: its sheet is not signed and no statement or licence is there.
    // (Other test files may add runs to it, so only what no test adds is expected missing.)
    const wisp = live.find((a: any) => a.entry.teamName === 'Cinder Hollow Engineering' && !a.sheet.locked)
    const readiness = await call('GET', `/api/attempts/${wisp.id}/readiness`, { cookie: cookie.team2 })
    expect(readiness.body.ready).toBe(false)
    const missing = readiness.body.items.filter((i: any) => !i.met).map((i: any) => i.key)
    expect(missing).toEqual(expect.arrayContaining(['timing-sheet', 'statements', 'licence']))
    const r = await call('POST', `/api/attempts/${wisp.id}/dossiers`, { cookie: cookie.team2 })
    expect(r.status).toBe(422)
    expect(r.body.data.issues.map((i: any) => i.path)).toEqual(missing)
    // Another team's attempt is not there at all for this team.
    expect((await call('GET', `/api/attempts/${wisp.id}/readiness`, { cookie: cookie.team })).status).toBe(404)
  })
})

describe('submission and ratification', { shuffle: false }, () => {
  // A claim of the test's own (the demo's are decided, and decided is final): a test event's pair, ready.
  let event: TestEvent
  let attemptId = 0
  let secondAttemptId = 0
  let observer = ''
  let v1 = { id: 0, version: 0 }
  const officialSigns = { password: 'first-password-1', typedName: 'Test official' }
  beforeAll(async () => {
    event = await newTestEvent('intl-motorcycle', 'Europe/Paris')
    const pair = await readyPair(event, 'Claim machine')
    attemptId = pair.attemptId
    observer = pair.second.cookie
    // A second pair of the team, its claim built later with the mail server down (invitations need it up).
    secondAttemptId = (await readyPair(event, 'Claim machine two')).attemptId
    const built = await call('POST', `/api/attempts/${attemptId}/dossiers`, { cookie: event.cookie.team })
    expect(built.status, JSON.stringify(built.body)).toBe(201)
    v1 = built.body
  })

  it('the demo\'s ratified claim is final: no new version of it is built, submitted or decided', async () => {
    const before = (await db.query('select count(*) from dossiers')).rows[0].count
    const demoAttempt = (await db.query('select attempt_id from dossiers where id = $1', [dossierId])).rows[0].attempt_id
    const again = await call('POST', `/api/attempts/${demoAttempt}/dossiers`, { cookie: cookie.team })
    expect(again.status).toBe(409)
    expect(again.body.statusMessage).toMatch(/^Version 1 of this claim was ratified on .*: a decided claim is final/)
    expect((await db.query('select count(*) from dossiers')).rows[0].count).toBe(before)
    expect((await call('POST', `/api/dossiers/${dossierId}/submission`, { cookie: cookie.team })).status).toBe(409)
  })

  it('a new version supersedes the old; submitting it e-mails the officials the PDF with its hash; they ratify it', async () => {
    expect((await call('POST', `/api/dossiers/${v1.id}/submission`, { cookie: event.cookie.team })).status).toBe(201)
    const built = await call('POST', `/api/attempts/${attemptId}/dossiers`, { cookie: event.cookie.team })
    expect(built.status).toBe(201)
    expect(built.body.version).toBe(v1.version + 1)
    expect((await call('POST', `/api/dossiers/${v1.id}/submission`, { cookie: event.cookie.team })).status).toBe(409) // v1: already submitted
    // The superseded version, though submitted, is never decided: only the latest of a claim is.
    const onOld = await call('POST', `/api/dossiers/${v1.id}/decision`, { cookie: event.cookie.official, body: { decision: 'refused', reasons: 'the old one', ...officialSigns } })
    expect(onOld.status).toBe(409)
    expect(onOld.body.statusMessage).toBe(`Version ${v1.version} is superseded by version ${built.body.version}: only the latest version of a claim is submitted or decided`)
    const submitted = await call('POST', `/api/dossiers/${built.body.id}/submission`, { cookie: event.cookie.team })
    expect(submitted.status).toBe(201)
    const mail = await mailTo(event.email.official, 'submitted for ratification')
    expect(mail.text).toContain(built.body.pdfSha256)
    const inbox = await (await fetch(`${inject('inboxUrl')}/api/messages`)).json() as any[]
    const withPdf = inbox.find(m => m.text.includes(built.body.pdfSha256) && m.to.includes(event.email.official))
    expect(withPdf.attachments[0]).toMatchObject({ contentType: 'application/pdf', size: built.body.pdfSize })

    // What became of each: the new version is the latest, not yet decided; the first is superseded by it.
    const get = async (id: number) => new Uint8Array(await (await fetch(url(`/api/dossiers/${id}/pdf`), { headers: { cookie: event.cookie.team } })).arrayBuffer())
    const newPdf = await get(built.body.id)
    const checked = (await verify(newPdf)).body
    expect(checked.standing).toMatchObject({ state: 'current', latestVersion: built.body.version })
    // The verification names what it checked: the test's machine, its team, the distance and the version.
    expect(checked.dossier).toMatchObject({ id: built.body.id, version: built.body.version, machineName: 'Claim machine', teamName: 'Test Team' })
    const old = (await verify(await get(v1.id))).body.standing
    expect(old.latestVersion).toBe(built.body.version)
    expect(old.words).toContain(`It is superseded: version ${built.body.version} is the latest of this attempt.`)
    const wrong = await call('POST', `/api/dossiers/${built.body.id}/decision`, { cookie: event.cookie.official, body: { decision: 'ratified', reasons: 'all in order', ...officialSigns, password: 'wrong' } })
    expect(wrong.status).toBe(422)
    const decided = await call('POST', `/api/dossiers/${built.body.id}/decision`, { cookie: event.cookie.official, body: { decision: 'ratified', reasons: 'all in order', ...officialSigns } })
    expect(decided.status, JSON.stringify(decided.body)).toBe(201)
    // The decision's signature covers the sealed file's hashes and the decision, as stored now.
    const report = (await call('GET', `/api/signatures/${decided.body.signatureId}`, { cookie: event.cookie.official })).body
    expect(report).toMatchObject({ kind: 'ratification', storedContentMatches: true, recordStillMatches: true })
    expect(report.content).toMatchObject({ dossier: built.body.id, decision: 'ratified', pdfSha256: built.body.pdfSha256 })
    expect((await call('POST', `/api/dossiers/${built.body.id}/decision`, { cookie: event.cookie.official, body: { decision: 'refused', reasons: 'changed my mind', ...officialSigns } })).status).toBe(409)
    await mailTo(event.email.team, 'ratified')
    expect((await verify(newPdf)).body.standing).toMatchObject({ state: 'ratified', words: 'It was ratified.' })
    const claims = (await call('GET', '/api/record-book')).body.claims
    expect(claims.find((c: any) => c.id === built.body.id)).toMatchObject({ status: 'ratified', machine: 'Claim machine' })
    expect(claims.some((c: any) => c.id === v1.id)).toBe(false) // superseded: the claim shows its latest version
    await expect(db.query('update dossiers set version = 9 where id = $1', [built.body.id])).rejects.toThrow(/append-only/)

    // Decided is final: no third version, nothing more submitted or decided on the claim.
    const count = (await db.query('select count(*) from dossiers where attempt_id = $1', [attemptId])).rows[0].count
    const third = await call('POST', `/api/attempts/${attemptId}/dossiers`, { cookie: event.cookie.team })
    expect(third.status).toBe(409)
    expect(third.body.statusMessage).toContain(`Version ${built.body.version} of this claim was ratified`)
    expect((await db.query('select count(*) from dossiers where attempt_id = $1', [attemptId])).rows[0].count).toBe(count)

    // Only a signed revocation reopens it, by the function the profile names (international: the sanctioning body's
    // observer, from memory): not by another official; both the decision and its revocation stay.
    const revoke = (cookie: string, typedName: string) => call('POST', `/api/dossiers/${built.body.id}/revocation`, {
      cookie, body: { reason: 'The survey certificate was found to be for another course.', password: 'first-password-1', typedName },
    })
    const byClerk = await revoke(event.cookie.official, 'Test official')
    expect(byClerk.status).toBe(403)
    expect(byClerk.body.statusMessage).toBe('Only the appointed observer of the sanctioning body revokes a ratification under this profile')
    const revoked = await revoke(observer, 'Second official')
    expect(revoked.status, JSON.stringify(revoked.body)).toBe(201)
    expect((await revoke(observer, 'Second official')).status).toBe(409)
    const revokedReport = (await call('GET', `/api/signatures/${revoked.body.signatureId}`, { cookie: event.cookie.official })).body
    expect(revokedReport).toMatchObject({ kind: 'revocation', storedContentMatches: true, recordStillMatches: true })
    expect((await verify(newPdf)).body.standing).toMatchObject({ state: 'revoked' })
    expect((await call('GET', '/api/record-book')).body.claims.find((c: any) => c.id === built.body.id))
      .toMatchObject({ status: 'revoked', reasons: 'The survey certificate was found to be for another course.' })
    const history = (await call('GET', `/api/attempts/${attemptId}/dossiers`, { cookie: event.cookie.team })).body
      .find((v: any) => v.id === built.body.id)
    expect(history).toMatchObject({ decision: { decision: 'ratified' }, revocation: { reason: expect.stringContaining('another course') } })
    // The claim is open again: a new version is built.
    expect((await call('POST', `/api/attempts/${attemptId}/dossiers`, { cookie: event.cookie.team })).status).toBe(201)
  })

  it('with the mail server down, the submission is kept and the e-mail goes out once it is back', async () => {
    const env = JSON.parse(inject('serverEnv'))
    const { readFileSync } = await import('node:fs')
    const smtpUp = () => new Promise<boolean>((ok) => {
      const socket = connect(env.smtpPort, '127.0.0.1', () => {
        socket.destroy()
        ok(true)
      }).once('error', () => ok(false))
    })
    process.kill(Number(readFileSync(env.catcherPidFile, 'utf8')), 'SIGTERM')
    let restarted = false
    const restart = async () => {
      if (restarted) return
      restarted = true
      const catcher = spawn(process.execPath, ['scripts/mail-catcher.mjs', '--smtp', String(env.smtpPort), '--http', String(env.inboxPort), '--dir', env.mailDir], { cwd: resolve(import.meta.dirname, '../..'), stdio: 'ignore' })
      writeFileSync(env.catcherPidFile, String(catcher.pid))
      await expect.poll(smtpUp, { timeout: 10_000 }).toBe(true)
    }
    try {
      await expect.poll(smtpUp, { timeout: 10_000 }).toBe(false)
      // The second pair of the test event's team, its claim not yet decided.
      const built = await call('POST', `/api/attempts/${secondAttemptId}/dossiers`, { cookie: event.cookie.team })
      expect(built.status, JSON.stringify(built.body)).toBe(201)
      const submitted = await call('POST', `/api/dossiers/${built.body.id}/submission`, { cookie: event.cookie.team })
      expect(submitted.status).toBe(201)
      expect(submitted.body.mail.sent).toBe(0)
      expect(submitted.body.message).toContain('will be retried')
      const pending = 'select count(*) from mail_outbox where sent_at is null and attachment_sha256 = $1'
      expect(Number((await db.query(pending, [built.body.pdfSha256])).rows[0].count)).toBeGreaterThan(0)
      await restart()
      await expect.poll(async () => Number((await db.query(pending, [built.body.pdfSha256])).rows[0].count), { timeout: 15_000, interval: 200 }).toBe(0)
      const inbox = await (await fetch(`${inject('inboxUrl')}/api/messages`)).json() as any[]
      expect(inbox.some(m => m.text.includes(built.body.pdfSha256))).toBe(true)
    }
    finally {
      await restart()
    }
  })
})
