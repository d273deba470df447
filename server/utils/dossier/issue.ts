import { createHash, randomUUID } from 'node:crypto'
import { mkdir, rm, writeFile } from 'node:fs/promises'
import { join } from 'node:path'
import { and, desc, eq, isNull, sql } from 'drizzle-orm'
import { buildManifest, PERSONAL_EVIDENCE, publicManifest, type Manifest } from './manifest'
import type { Readiness } from './readiness'
import { renderDossier, type Attachment } from './render'

const sha256Hex = (b: Uint8Array | string) => createHash('sha256').update(b).digest('hex')

/** Issues a new sealed dossier version for a ready attempt; refuses naming what is missing. */
export async function issueDossier(eventId: number, attemptId: number, userId: number, distanceId?: number,
  /** Only for the demo's seed, which issues on its own calendar; otherwise now. */
  seededAt?: Date) {
  await attemptOfEvent(eventId, attemptId)
  const r = await readinessOf(eventId, attemptId, distanceId)
  await refuseIfDecided(attemptId, r.distance.id)
  refuseUnlessReady(r)
  const previous = await latestDossier(attemptId, r.distance.id)
  const version = (previous?.version ?? 0) + 1
  const manifest = await buildManifest(r, version, seededAt ?? new Date())
  const attach = await evidenceToAttach(manifest)
  const officials = await sealAndRender(manifest, attach)
  // The public copy (the record book's): sealed the same way, over a manifest without personal data.
  const notPersonal = attach.filter(a => !PERSONAL_EVIDENCE.has(a.kind ?? ''))
  const open = await sealAndRender(publicManifest(manifest), notPersonal)
  await storeBlob(open.pdf)
  return storeDossier(officials.pdf, {
    publicPdfSha256: sha256Hex(open.pdf),
    publicPdfSize: open.pdf.length,
    publicManifestSha256: open.manifestSha,
    eventId,
    attemptId,
    distanceId: r.distance.id,
    version,
    manifest,
    manifestSha256: officials.manifestSha,
    seal: officials.seal,
    keyFingerprint: useSealKey().fingerprint,
    supersedesId: previous?.id ?? null,
    createdBy: userId,
    ...(seededAt ? { createdAt: seededAt } : {}),
  })
}

/** Seals a manifest (Ed25519 over its SHA-256) and renders its PDF with the files to attach. */
async function sealAndRender(manifest: Manifest, attach: Attachment[]) {
  const manifestSha = sha256Hex(canonicalJson(manifest))
  const key = useSealKey()
  const seal = sealDigest(manifestSha)
  const verifyUrl = `${useRuntimeConfig().siteUrl.replace(/\/$/, '')}/verify`
  const unsigned = await renderDossier(
    manifest,
    { sha256: manifestSha, signature: seal, fingerprint: key.fingerprint, verifyUrl },
    attach,
  )
  // The standard PDF signature over the whole file, by the installation's certificate.
  const pdf = await signPdf(unsigned, [key.certificatePem, ...key.chainPem], key.certificateKey)
  return { manifestSha, seal, pdf }
}

function refuseUnlessReady(r: Readiness) {
  if (r.ready) return
  const missing = r.items.filter(i => !i.met)
  throw createError({
    statusCode: 422,
    statusMessage: 'Not ready',
    message: `not ready: ${missing.map(i => i.label).join('; ')}`,
    data: { issues: missing.map(i => ({ path: i.key, message: `${i.label}: ${i.detail}` })) },
  })
}

/**
 * Small files travel inside, smallest first, up to the configured total; the rest is referenced by
 * hash only, and no stored file is read again to hash it: the hashes come from their rows.
 */
async function evidenceToAttach(manifest: Manifest) {
  const budget = Number(useRuntimeConfig().dossierAttachBytes)
  let used = 0
  const attach: Attachment[] = []
  const seen = new Set<string>()
  for (const e of [...manifest.evidence].sort((a, b) => Number(a.size) - Number(b.size))) {
    if (seen.has(e.sha256) || used + Number(e.size) > budget) continue
    seen.add(e.sha256)
    const chunks: Buffer[] = []
    for await (const c of await useBlobStore().open(e.sha256)) chunks.push(c as Buffer)
    attach.push({ name: e.name, bytes: Buffer.concat(chunks), mediaType: e.mediaType, sha256: e.sha256, kind: e.kind })
    used += Number(e.size)
  }
  return attach
}

type NewDossier = Omit<typeof tables.dossiers.$inferInsert, 'pdfSha256' | 'pdfSize'>

/** Puts a PDF in the blob store under its hash (content-addressed: storing it twice is harmless). */
async function storeBlob(pdf: Uint8Array) {
  const pdfSha = sha256Hex(pdf)
  await mkdir(uploadTmpDir(), { recursive: true })
  const tmp = join(uploadTmpDir(), `${randomUUID()}.pdf`)
  await writeFile(tmp, pdf)
  try {
    if (!(await useBlobStore().has(pdfSha))) await useBlobStore().put(pdfSha, tmp, pdf.length, 'application/pdf')
  }
  finally {
    await rm(tmp, { force: true })
  }
  return pdfSha
}

/** Stores the PDF in the blob store, then its row (no connection is held while the bytes move). */
async function storeDossier(pdf: Uint8Array, values: NewDossier) {
  const pdfSha = await storeBlob(pdf)
  // Under the claim's lock, as a decision takes it: a version is never added beside a decided claim.
  return useDb().transaction(async (tx) => {
    await lockClaim(tx, values.attemptId, values.distanceId)
    await refuseIfDecided(values.attemptId, values.distanceId, tx)
    const [row] = await tx.insert(tables.dossiers)
      .values({ ...values, pdfSha256: pdfSha, pdfSize: pdf.length })
      .returning()
    return row!
  })
}

/** One writer at a time on a claim (an attempt over one distance): a new version, a submission or a decision. */
export async function lockClaim(tx: Tx, attemptId: number, distanceId: number) {
  await tx.execute(sql`select pg_advisory_xact_lock(hashtextextended(${`claim:${attemptId}:${distanceId}`}, 0))`)
}

/**
 * Decided is final: once a version of a claim is ratified, no new version of it is built or submitted and no other
 * version is decided, until the ratification is revoked (signed, with reasons: revokeRatification). A refused claim
 * may be corrected and submitted again as a new version.
 */
export async function refuseIfDecided(attemptId: number, distanceId: number, db: Tx | Db = useDb()) {
  const [ratified] = await db.select({ version: tables.dossiers.version, at: tables.decisions.decidedAt })
    .from(tables.decisions)
    .innerJoin(tables.dossiers, eq(tables.dossiers.id, tables.decisions.dossierId))
    .leftJoin(tables.claimRevocations, eq(tables.claimRevocations.dossierId, tables.dossiers.id))
    .where(and(eq(tables.dossiers.attemptId, attemptId), eq(tables.dossiers.distanceId, distanceId),
      eq(tables.decisions.decision, 'ratified'), isNull(tables.claimRevocations.id)))
    .limit(1)
  if (ratified) {
    throw conflict(`Version ${ratified.version} of this claim was ratified on ${ratified.at.toISOString()}: a decided `
      + 'claim is final, so no new version is built, submitted or decided')
  }
}

/** The latest version of an attempt's dossier for one claimed distance. */
export async function latestDossier(attemptId: number, distanceId: number) {
  const [row] = await useDb()
    .select()
    .from(tables.dossiers)
    .where(and(eq(tables.dossiers.attemptId, attemptId), eq(tables.dossiers.distanceId, distanceId)))
    .orderBy(desc(tables.dossiers.version))
    .limit(1)
  return row ?? null
}
