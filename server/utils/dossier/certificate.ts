import { eq } from 'drizzle-orm'
import { PDFDocument } from 'pdf-lib'
import { embedDossierFonts } from './fonts'
import { PdfLayout } from './pdf-layout'
import type { Manifest } from './manifest'
import { localDate } from '#shared/rules/zoned'

const homologated = (h: { reference: string, homologatedOn: string }): [string, string] =>
  ['Homologated', `by the sanctioning body, reference ${h.reference}, ${h.homologatedOn}`]

/**
 * Certificates already made, by dossier and homologation: a public page links them, so a download does
 * not render and sign again (a few dozen are kept; each is a few tens of kB).
 */
const made = new Map<string, { pdf: Uint8Array, name: string }>()
const MADE_KEPT = 50

/**
 * The record holder's certificate: one page, black on white, for a ratified dossier: machine, rider,
 * team, class, distance, the figure in both units, date and place, who witnessed and who ratified, and
 * the dossier it rests on by its SHA-256. Signed with the installation's certificate like the dossier
 * (any PDF reader shows the signature). Made on request from what is sealed: nothing new is asserted.
 */
export async function recordCertificate(dossierId: number) {
  const [row] = await useDb()
    .select({ d: tables.dossiers, decision: tables.decisions, by: tables.users.name, h: tables.homologations })
    .from(tables.dossiers)
    .innerJoin(tables.decisions, eq(tables.decisions.dossierId, tables.dossiers.id))
    .leftJoin(tables.homologations, eq(tables.homologations.dossierId, tables.dossiers.id))
    .innerJoin(tables.users, eq(tables.users.id, tables.decisions.decidedBy))
    .where(eq(tables.dossiers.id, dossierId))
  if (!row || row.decision.decision !== 'ratified') throw notFound('No ratified record for this dossier')
  const cacheKey = `${dossierId}:${row.h?.signatureId ?? 0}`
  const cached = made.get(cacheKey)
  if (cached) return cached
  const m = row.d.manifest as Manifest
  const counted = m.runs.filter(r => r.counted)
  const lastRun = Math.max(...counted.map(r => Date.parse(r.startedAt)))
  const doc = await PDFDocument.create()
  doc.setTitle(`Record certificate: ${m.entry.className}, ${m.entry.distanceLabel}`)
  doc.setProducer('Trapline')
  doc.setCreator('Trapline')
  const issued = new Date(row.decision.decidedAt)
  doc.setCreationDate(issued)
  doc.setModificationDate(issued)
  const L = new PdfLayout(doc, await embedDossierFonts(doc), `${m.event.name} · record certificate`)
  L.heading('Record certificate', 22)
  L.text(`${m.entry.className} · ${m.entry.distanceLabel}`, { size: 14, bold: true })
  L.text(`${m.result.kmh} km/h = ${m.result.mph} mph`, { size: 20, bold: true, gap: 8 })
  L.pairs([
    ['Machine', m.entry.machineName],
    ['Rider', m.entry.riderName],
    ['Team', m.entry.teamName],
    ['Date', localDate(lastRun, m.event.timeZone)],
    ['Place', `${m.event.name}, ${m.event.venue}`],
    ['Rule profile', `${m.profile.name} v${m.profile.version}`],
    ['Runs', counted.map(r => `#${r.id} ${r.direction}`).join(', ')],
  ])
  L.heading('Signatories', 12)
  L.pairs([
    ...m.statements.filter(s => !s.withdraws && !s.withdrawnBy)
      .map(s => ['Witness', `${s.typedName}, ${s.signedAt.slice(0, 10)}`] as [string, string]),
    ['Ratified by', `${row.by}, ${issued.toISOString().slice(0, 10)}`],
    ...(row.h?.signatureId ? [homologated(row.h)] : []),
  ])
  L.text(`Rests on dossier version ${row.d.version} of attempt #${row.d.attemptId}, PDF SHA-256 `
    + `${row.d.pdfSha256}. Check either file on the verification page or with npm run verify.`, { color: 'grey' })
  L.text('Trapline records and computes; the sanctioning body\'s rulebook and officials decide.', {
    color: 'grey',
    size: 8,
  })
  L.finish()
  addSignaturePlaceholder(doc, {
    reason: `Record certificate for dossier version ${row.d.version} of attempt #${row.d.attemptId}`,
    name: 'Trapline dossier seal',
    location: m.event.venue ?? '',
  })
  const key = useSealKey()
  const unsigned = await doc.save({ useObjectStreams: false })
  const pdf = await signPdf(unsigned, [key.certificatePem, ...key.chainPem], key.certificateKey)
  const certificate = { pdf, name: `trapline-certificate-attempt-${row.d.attemptId}-v${row.d.version}.pdf` }
  if (made.size >= MADE_KEPT) made.delete(made.keys().next().value!)
  made.set(cacheKey, certificate)
  return certificate
}
