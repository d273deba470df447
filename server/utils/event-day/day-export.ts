import Papa from 'papaparse'
import type { DayPaper } from './day-paper'

/** The day's runs, one row each, units in the headers: the same rows in the CSV and the workbook. */
export const DAY_HEADERS = ['Order', 'Left the line (local)', 'Run', 'Attempt', 'Team', 'Machine', 'Rider', 'Class',
  'Direction', 'Start', 'Status', 'Distance', 'Time (s)', 'Speed (km/h)', 'Speed (mph)'] as const

function dayRows(p: DayPaper) {
  return p.runOrder.map(r => [r.order, r.startedAt, r.runId, r.attemptId, r.teamName, r.machineName, r.riderName,
    r.className, r.direction, r.start, r.status, r.distance, r.timeS ?? '', r.kmh ?? '', r.mph ?? ''])
}

export function dayCsv(p: DayPaper) {
  return Papa.unparse({ fields: [...DAY_HEADERS], data: dayRows(p) })
}

/** The workbook: the runs (times and speeds as numbers shown to their decimals) and the start list. */
export async function dayXlsx(p: DayPaper) {
  const { default: ExcelJS } = await import('exceljs')
  const wb = new ExcelJS.Workbook()
  wb.creator = 'Trapline'
  const runs = wb.addWorksheet(`Runs ${p.date}`, { views: [{ state: 'frozen', ySplit: 1 }] })
  runs.columns = DAY_HEADERS.map(h => ({ header: h, key: h, width: Math.max(10, h.length + 2) }))
  for (const row of dayRows(p)) {
    runs.addRow(row.map((v, i) => (i >= 12 && v !== '' ? Number(v) : v)))
  }
  const timeDecimals = Math.max(...p.systems.map(s => String(s.ticksPerSecond).length - 1), 3)
  runs.getColumn(13).numFmt = `0.${'0'.repeat(timeDecimals)}`
  runs.getColumn(14).numFmt = '0.000'
  runs.getColumn(15).numFmt = '0.000'
  runs.getRow(1).font = { bold: true }
  const start = wb.addWorksheet('Start list', { views: [{ state: 'frozen', ySplit: 1 }] })
  start.columns = ['Team', 'Machine', 'Rider', 'Class', 'Distances'].map(h => ({ header: h, key: h, width: 24 }))
  for (const e of p.startList) start.addRow([e.teamName, e.machineName, e.riderName, e.className, e.distances])
  start.getRow(1).font = { bold: true }
  return Buffer.from(await wb.xlsx.writeBuffer())
}
