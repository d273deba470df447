import Papa from 'papaparse'

/** The payments for the accounts, one row each, amounts in the event's currency as decimals (not floats). */
export const PAYMENT_HEADERS = ['Receipt', 'Paid at (UTC)', 'Team', 'Machine', 'Entry', 'Fee', 'Currency', 'Amount',
  'Refunded', 'Net', 'Status', 'Provider reference'] as const

const decimal = (minor: number, currency: string) => formatMoney(minor, currency).split(' ')[0]!.replace(/,/g, '')

export function paymentRows(list: Awaited<ReturnType<typeof paymentsAt>>['payments']) {
  return list.map(p => [p.receiptNo ?? '', p.paidAt?.toISOString() ?? '', p.team, p.machine, p.entryId, feeName(p.fee),
    p.currency.toUpperCase(), decimal(p.amountMinor, p.currency), decimal(p.refundedMinor, p.currency),
    decimal(p.amountMinor - p.refundedMinor, p.currency), p.status, p.providerPaymentId ?? p.providerSessionId])
}

export const paymentsCsv = (list: Awaited<ReturnType<typeof paymentsAt>>['payments']) =>
  Papa.unparse({ fields: [...PAYMENT_HEADERS], data: paymentRows(list) })

export async function paymentsXlsx(list: Awaited<ReturnType<typeof paymentsAt>>['payments']) {
  const { default: ExcelJS } = await import('exceljs')
  const wb = new ExcelJS.Workbook()
  wb.creator = 'Trapline'
  const sheet = wb.addWorksheet('Payments', { views: [{ state: 'frozen', ySplit: 1 }] })
  sheet.columns = PAYMENT_HEADERS.map(h => ({ header: h, key: h, width: Math.max(12, h.length + 2) }))
  for (const row of paymentRows(list)) sheet.addRow(row.map((v, i) => (i >= 7 && i <= 9 ? Number(v) : v)))
  for (const c of [8, 9, 10]) sheet.getColumn(c).numFmt = '0.00'
  sheet.getRow(1).font = { bold: true }
  return Buffer.from(await wb.xlsx.writeBuffer())
}

/** A receipt on one page. */
export async function receiptPdf(
  p: typeof tables.payments.$inferSelect,
  names: { event: string, team: string, machine: string },
) {
  const { PDFDocument } = await import('pdf-lib')
  const doc = await PDFDocument.create()
  doc.setTitle(`Receipt ${p.receiptNo}`)
  doc.setProducer('Trapline')
  const L = new PdfLayout(doc, await embedDossierFonts(doc), `${names.event} · receipt`)
  L.heading(`Receipt ${p.receiptNo}`, 20)
  L.pairs([
    ['Event', names.event],
    ['Received from', `${names.team} (entry #${p.entryId}, ${names.machine})`],
    ['For', feeName(p.fee)],
    ['Amount', formatMoney(p.amountMinor, p.currency)],
    ['Paid', p.paidAt ? `${p.paidAt.toISOString().slice(0, 16).replace('T', ' ')} UTC` : 'not paid'],
    ['Payment reference', p.providerPaymentId ?? ''],
    ...(p.refundedMinor ? [['Refunded', formatMoney(p.refundedMinor, p.currency)] as [string, string]] : []),
  ])
  L.text('Paid through the payment provider\'s hosted checkout; Trapline never sees card details.',
    { color: 'grey', gap: 18 })
  L.finish()
  return doc.save()
}
