import { and, asc, desc, eq, isNull } from 'drizzle-orm'
import { convertSpeed, publishedInMs } from '#shared/rules/units'
import { cmp, fromDecimal, toFixed } from '#shared/rules/exact'
import { localDate } from '#shared/rules/zoned'
import { buildRecordBook } from '#shared/rules/record-book'
import { profiles } from '#shared/rules/profiles'
import { CLAIM_STATUSES, type ClaimStatus } from '#shared/constants'
import type { RecordBookQuery } from '#shared/schemas/record-book'
import type { Manifest } from './manifest'

/** The profile a record is kept under: the library profile an event's copy was adapted from. */
const profileName = (p: { id: string, name: string }) =>
  profiles[p.id.replace(/-adapted$/, '') as keyof typeof profiles]?.name ?? p.name

/**
 * Every submitted dossier with what became of it, oldest first; `latest` marks the latest submitted
 * version of each claim (an attempt's result over one distance).
 */
async function claimRows() {
  const t = tables
  const rows = await useDb()
    .select({ d: t.dossiers, decision: t.decisions, h: t.homologations, w: t.withdrawals, revoked: t.claimRevocations })
    .from(t.submissions)
    .innerJoin(t.dossiers, eq(t.dossiers.id, t.submissions.dossierId))
    .leftJoin(t.decisions, eq(t.decisions.dossierId, t.dossiers.id))
    .leftJoin(t.homologations, eq(t.homologations.dossierId, t.dossiers.id))
    .leftJoin(t.withdrawals, eq(t.withdrawals.dossierId, t.dossiers.id))
    .leftJoin(t.claimRevocations, eq(t.claimRevocations.dossierId, t.dossiers.id))
    .orderBy(asc(t.submissions.id))
  const latest = new Map<string, number>()
  for (const r of rows) latest.set(`${r.d.attemptId}:${r.d.distanceId}`, r.d.id)
  return rows.map((r) => {
    const status: ClaimStatus = r.w
      ? 'withdrawn'
      : r.revoked
        ? 'revoked'
        : r.decision?.decision === 'refused'
          ? 'refused'
          : r.decision
            ? (r.h?.signatureId ? 'homologated' : 'ratified')
            : 'claimed'
    const isLatest = latest.get(`${r.d.attemptId}:${r.d.distanceId}`) === r.d.id
    return { ...r, status, latest: isLatest, order: r.decision?.id ?? Number.MAX_SAFE_INTEGER }
  })
}
type ClaimRow = Awaited<ReturnType<typeof claimRows>>[number]

/** A claim as the registry shows it: figures as published, the local date of its runs, its links. */
function claimView(r: ClaimRow, site: string, protested: Set<number>) {
  const m = r.d.manifest as Manifest
  const lastRun = Math.max(...m.runs.filter(x => x.counted).map(x => Date.parse(x.startedAt)))
  const decided = r.status === 'ratified' || r.status === 'homologated'
  return {
    id: r.d.id,
    status: r.status,
    profile: profileName(m.profile),
    class: m.entry.className,
    distance: m.entry.distanceLabel,
    speedKmh: m.result.kmh!,
    speedMph: m.result.mph!,
    date: localDate(lastRun, m.event.timeZone),
    event: m.event.name,
    machine: m.entry.machineName,
    rider: m.entry.riderName,
    team: m.entry.teamName,
    /** Why it was refused or withdrawn, in the officials' or the team's words. */
    reasons: r.w?.reason ?? r.revoked?.reason ?? (r.decision?.decision === 'refused' ? r.decision.reasons : null),
    dossierUrl: `${site}/api/dossiers/${r.d.id}/pdf`,
    certificateUrl: decided ? `${site}/api/dossiers/${r.d.id}/certificate` : null,
    verifyUrl: `${site}/verify`,
    homologation: r.h?.signatureId ? { reference: r.h.reference, on: r.h.homologatedOn } : null,
    /** A protest or appeal on its attempt is not yet decided: the claim waits on it. */
    underProtest: protested.has(r.d.attemptId),
  }
}
type ClaimView = ReturnType<typeof claimView>

/** Records and minimums entered by the organisers, with the profile of their event. */
async function enteredRecords() {
  const t = tables
  return useDb()
    .select({ r: t.standingRecords, event: t.events.name, profile: t.events.profile })
    .from(t.standingRecords)
    .innerJoin(t.events, eq(t.events.id, t.standingRecords.eventId))
    .where(and(isNull(t.standingRecords.dossierId), isNull(t.standingRecords.retiredAt)))
    .orderBy(desc(t.standingRecords.setOn), asc(t.standingRecords.id))
}
type Entered = Awaited<ReturnType<typeof enteredRecords>>[number]

/** A record an organiser entered as it stood before the event, in the shape of a holder. */
function enteredHolder(e: Entered) {
  const ms = publishedInMs(e.r)
  return {
    status: 'entered' as const,
    profile: profileName(e.profile),
    class: e.r.className,
    distance: e.r.distanceLabel,
    speedKmh: e.r.unit === 'km/h' ? e.r.speed : toFixed(convertSpeed(ms, 'm/s', 'km/h'), 3),
    speedMph: e.r.unit === 'mph' ? e.r.speed : toFixed(convertSpeed(ms, 'm/s', 'mph'), 3),
    publishedIn: e.r.unit,
    date: e.r.setOn ?? '',
    event: e.event,
    note: e.r.note,
  }
}

const sameSlot = (a: { profile: string, class: string, distance: string }, b: typeof a) =>
  a.profile === b.profile && a.class === b.class && a.distance === b.distance

/**
 * The record book as a registry: per profile, class and distance the current record (the fastest
 * carried-forward ratified result) with the holders it displaced, ratified ones first and then the
 * records entered as they stood before; every claim with its status; vacant classes with the minimum
 * an organiser set; and the results a best-per-day rule did not carry forward.
 */
export async function recordBook(query: RecordBookQuery = {}) {
  const site = useRuntimeConfig().siteUrl.replace(/\/$/, '')
  const [claims, entered, open] = await Promise.all([claimRows(), enteredRecords(),
    useDb().selectDistinct({ attemptId: tables.protests.attemptId }).from(tables.protests)
      .where(isNull(tables.protests.decidedAt))])
  const protested = new Set(open.map(o => o.attemptId))
  const views = new Map(claims.map(c => [c.d.id, claimView(c, site, protested)]))
  // Records come from every ratified version (the latest ratified one of a claim stands); the claims list
  // shows what became of the latest version submitted.
  const ratified = claims.filter(c => c.status === 'ratified' || c.status === 'homologated')
  const book = buildRecordBook(ratified.map((c) => {
    const v = views.get(c.d.id)!
    const m = c.d.manifest as Manifest
    return {
      attemptId: c.d.attemptId,
      profile: v.profile,
      className: v.class,
      distanceLabel: v.distance,
      kmh: v.speedKmh,
      date: v.date,
      bestPerDayOnly: m.profile.bestPerDayOnly?.value === true,
      order: c.order,
      extra: v,
    }
  }))
  const holders = entered.filter(e => !e.r.minimum).map(enteredHolder)
  const records = book.records.map(({ extra, history: displaced }) => {
    const history = displaced.map(h => h.extra)
    const oldest = [extra, ...history].at(-1)!
    const slower = (h: { speedKmh: string }) => cmp(fromDecimal(h.speedKmh), fromDecimal(oldest.speedKmh)) < 0
    const before = holders.filter(h => sameSlot(h, extra) && slower(h))
    return { ...extra, history: [...history, ...before] }
  })
  const vacant = entered.filter(e => e.r.minimum).map(enteredHolder)
    .filter(v => !records.some(r => sameSlot(r, v)))
    .map(({ status: _, ...v }) => ({
      ...v,
      minimum: { speed: v.publishedIn === 'mph' ? v.speedMph : v.speedKmh, unit: v.publishedIn },
    }))
  const all = { records, claims: claims.filter(c => c.latest).map(c => views.get(c.d.id)!), vacant }
  return {
    ...filterBook(all, query),
    notCarriedForward: book.notCarriedForward.map(r => ({ ...r.extra, bestOfDay: r.bestOfDay.extra })),
    choices: bookChoices(all),
  }
}

type Row = { profile: string, class: string, distance: string, date: string, status?: string } & Partial<ClaimView>

/** Whether a row answers the registry's filters and search (case aside). */
function matches(r: Row, q: RecordBookQuery) {
  if (q.profile && r.profile !== q.profile) return false
  if (q.class && r.class !== q.class) return false
  if (q.distance && r.distance !== q.distance) return false
  if (q.status && r.status !== q.status) return false
  if (q.year && !r.date.startsWith(String(q.year))) return false
  if (!q.q) return true
  const words = [r.profile, r.class, r.distance, r.machine, r.rider, r.team, r.event].join(' ').toLowerCase()
  return q.q.toLowerCase().split(/\s+/).every(w => words.includes(w))
}

function filterBook<T extends { records: Row[], claims: Row[], vacant: Row[] }>(all: T, q: RecordBookQuery): T {
  const { status: _, ...noStatus } = q
  return {
    ...all,
    records: all.records.filter(r => matches(r, q)),
    claims: all.claims.filter(r => matches(r, q)),
    // A vacant class has no claim status of its own.
    vacant: q.status ? [] : all.vacant.filter(r => matches(r, noStatus)),
  }
}

/** The values the registry's filters offer, from everything in it. */
function bookChoices(all: { records: Row[], claims: Row[], vacant: Row[] }) {
  const rows = [...all.records, ...all.claims, ...all.vacant]
  const sorted = (xs: string[]) => [...new Set(xs)].filter(Boolean).sort()
  return {
    profiles: sorted(rows.map(r => r.profile)),
    classes: sorted(rows.map(r => r.class)),
    distances: sorted(rows.map(r => r.distance)),
    years: sorted(rows.map(r => r.date.slice(0, 4))).reverse(),
    statuses: [...CLAIM_STATUSES],
  }
}

export type RecordBookView = Awaited<ReturnType<typeof recordBook>>

/** The columns of the exports, units in the headers. */
export const EXPORT_HEADERS = [
  'Profile', 'Class', 'Distance', 'Speed (km/h)', 'Speed (mph)', 'Date (local)', 'Machine', 'Rider', 'Team',
  'Holder', 'Status', 'Homologation reference', 'Dossier',
] as const

/** Each record and each previous holder as a flat row for an export, figures as published. */
export function exportRows(book: RecordBookView): Record<(typeof EXPORT_HEADERS)[number], string>[] {
  type Holder = RecordBookView['records'][number]['history'][number] | RecordBookView['records'][number]
  const line = (r: Holder, holder: 'current' | 'previous') => ({
    'Profile': r.profile,
    'Class': r.class,
    'Distance': r.distance,
    'Speed (km/h)': r.speedKmh,
    'Speed (mph)': r.speedMph,
    'Date (local)': r.date,
    'Machine': 'machine' in r ? r.machine : '',
    'Rider': 'rider' in r ? r.rider : '',
    'Team': 'team' in r ? r.team : '',
    'Holder': holder,
    'Status': r.status,
    'Homologation reference': ('homologation' in r ? r.homologation?.reference : '') ?? '',
    'Dossier': 'dossierUrl' in r ? r.dossierUrl : '',
  })
  return book.records.flatMap(r => [line(r, 'current'), ...r.history.map(h => line(h, 'previous'))])
}

/**
 * The same rows as an Excel workbook (exceljs): speeds as numbers with three decimals shown (the
 * published figures are exact decimals of three places, which a double holds to the digit), a frozen
 * header row, one sheet for the records and one for every claim with its status.
 */
export async function recordBookXlsx(book: RecordBookView) {
  const { default: ExcelJS } = await import('exceljs')
  const wb = new ExcelJS.Workbook()
  wb.creator = 'Trapline'
  const sheet = wb.addWorksheet('Records', { views: [{ state: 'frozen', ySplit: 1 }] })
  sheet.columns = EXPORT_HEADERS.map(h => ({ header: h, key: h, width: Math.max(12, h.length + 2) }))
  const speeds = new Set(['Speed (km/h)', 'Speed (mph)'])
  for (const row of exportRows(book)) {
    sheet.addRow(Object.fromEntries(Object.entries(row).map(([k, v]) => [k, speeds.has(k) && v ? Number(v) : v])))
  }
  for (const h of speeds) sheet.getColumn(h).numFmt = '0.000'
  sheet.getRow(1).font = { bold: true }
  const claims = wb.addWorksheet('Claims', { views: [{ state: 'frozen', ySplit: 1 }] })
  const claimHeaders = ['Status', 'Profile', 'Class', 'Distance', 'Speed (km/h)', 'Speed (mph)', 'Date (local)',
    'Machine', 'Rider', 'Team', 'Event', 'Reasons']
  claims.columns = claimHeaders.map(h => ({ header: h, key: h, width: Math.max(12, h.length + 2) }))
  for (const c of book.claims) {
    claims.addRow([c.status, c.profile, c.class, c.distance, Number(c.speedKmh), Number(c.speedMph), c.date,
      c.machine, c.rider, c.team, c.event, c.reasons ?? ''])
  }
  for (const h of speeds) claims.getColumn(h).numFmt = '0.000'
  claims.getRow(1).font = { bold: true }
  return Buffer.from(await wb.xlsx.writeBuffer())
}

/**
 * The team withdraws its submitted claim before the officials decide, with a reason; the dossier row is
 * locked, as a decision locks it, so a claim is withdrawn or decided, never both.
 */
export async function withdrawClaim(dossierId: number, reason: string, userId: number) {
  return useDb().transaction(async (tx) => {
    const [d] = await tx.select().from(tables.dossiers).where(eq(tables.dossiers.id, dossierId)).for('update')
    if (!d) throw notFound('No such dossier')
    const [submitted] = await tx.select().from(tables.submissions).where(eq(tables.submissions.dossierId, dossierId))
    if (!submitted) throw conflict('This dossier has not been submitted: there is no claim to withdraw')
    const [decision] = await tx.select().from(tables.decisions).where(eq(tables.decisions.dossierId, dossierId))
    if (decision) throw conflict(`The officials have already ${decision.decision} this claim`)
    const [row] = await tx.insert(tables.withdrawals).values({ dossierId, reason, withdrawnBy: userId })
      .onConflictDoNothing().returning()
    if (!row) throw conflict('This claim is already withdrawn')
    return row
  })
}

/** The decision on a dossier is refused once its claim is withdrawn. */
export async function refuseIfWithdrawn(dossierId: number, db: Tx | Db = useDb()) {
  const [w] = await db.select().from(tables.withdrawals).where(eq(tables.withdrawals.dossierId, dossierId))
  if (w) throw conflict(`The team withdrew this claim on ${w.withdrawnAt.toISOString()}: ${w.reason}`)
}
