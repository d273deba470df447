import ExcelJS from 'exceljs'
import Papa from 'papaparse'
import { beforeAll, expect, it } from 'vitest'
import { call, demoEventId, login, url, useTestServer } from '../support/api'
import { secondsOfDay, speedOver } from '../support/hand'
import { pdfText } from '../support/pdf-tools'
import { localDate } from '#shared/rules/zoned'

await useTestServer()

// The day's paper of the demo: its record day holds the streamliner's two runs over the flying mile with the
// flying kilometre inside it. Each figure is checked by hand (mathjs, v = d / t, 1 km/h = 1/3.6 m/s and
// 1 mile = 1609.344 m, NIST SP 811 appendix B; figures truncated to 3 decimals, FIM world records page).
let cookie = ''
let eventId = 0
let day = ''
let run: any
let sheet: any

beforeAll(async () => {
  cookie = await login('timekeeper@trapline.test')
  eventId = await demoEventId(cookie)
  sheet = (await call('GET', `/api/events/${eventId}/run-sheet`, { cookie })).body
  const streamliner = sheet.attempts.find((a: any) => a.entry.machineName === 'Larkspur Fennwick streamliner' && a.sheet.locked)
  run = streamliner.runs[0]
  day = localDate(Date.parse(run.startedAt), sheet.timeZone)
})

const bytes = async (path: string, who = cookie) => {
  const r = await fetch(url(path), { headers: { cookie: who } })
  return { status: r.status, type: r.headers.get('content-type'), body: new Uint8Array(await r.arrayBuffer()) }
}

it('prints a run\'s time slip with its time and speed over every distance it claims, figured from its readings', async () => {
  const slip = (await call('GET', `/api/runs/${run.id}/time-slip`, { cookie })).body
  const trap = (label: string) => sheet.traps.find((t: any) => t.label === label).id
  const primary = sheet.systems.find((s: any) => s.role === 'primary').id
  const at = (label: string) => secondsOfDay(run.readings.find((g: any) => g.trapId === trap(label) && g.systemId === primary).time)
  const [a, b] = run.direction === 'out' ? ['in', 'out'] : ['out', 'in']
  const mile = speedOver('1609.344', at(`M-${b}`).sub(at(`M-${a}`)))
  const km = speedOver('1000', at(`K-${b}`).sub(at(`K-${a}`)))
  expect(slip.distances.find((d: any) => d.label === 'Flying mile')).toMatchObject({ kmh: mile.kmh, mph: mile.mph })
  expect(slip.distances.find((d: any) => d.label === 'Flying kilometre')).toMatchObject({ kmh: km.kmh, mph: km.mph })
  expect(slip.run.startedAt.slice(0, 10)).toBe(day)
  const pdf = await bytes(`/api/runs/${run.id}/time-slip.pdf`)
  expect(pdf.type).toBe('application/pdf')
  const text = await pdfText(pdf.body, 'time-slip.pdf')
  expect(text).toContain(`Time slip · run #${run.id}`)
  expect(text).toContain(mile.kmh)
  expect(text).toContain(km.kmh)
  expect(text).toContain(sheet.timeZone)
  expect(text).toContain('does not certify safety')
  // Another team acting as a team does not print this team's slip.
  const other = await call('GET', `/api/runs/${run.id}/time-slip`, { cookie: await login('team2@trapline.test') })
  expect(other.status).toBe(404)
})

it('prints the start list, the run order and the results by class of the day, and exports the day', async () => {
  const paper = (await call('GET', `/api/events/${eventId}/paper?date=${day}`, { cookie })).body
  expect(paper.date).toBe(day)
  const order = paper.runOrder.map((r: any) => r.runId)
  expect(order).toContain(run.id)
  const times = paper.runOrder.map((r: any) => r.startedAt)
  expect([...times].sort()).toEqual(times) // in the order they left the line
  const streamlinerClass = paper.results.find((c: any) => c.attempts.some((a: any) => a.machineName === 'Larkspur Fennwick streamliner'))
  const mileResult = streamlinerClass.attempts.find((a: any) => a.signed).distances.find((d: any) => d.label === 'Flying mile')
  const results = await pdfText((await bytes(`/api/events/${eventId}/paper.pdf?date=${day}&sheet=results`)).body, 'results.pdf')
  expect(results).toContain(`Results by class, ${day}`)
  expect(results).toContain(streamlinerClass.className)
  expect(results).toContain(`${mileResult.kmh} km/h`)
  const start = await pdfText((await bytes(`/api/events/${eventId}/paper.pdf?date=${day}&sheet=start-list`)).body, 'start.pdf')
  expect(start).toContain('Run order')
  expect(start).toContain('Larkspur Fennwick streamliner')
  const blank = await pdfText((await bytes(`/api/events/${eventId}/paper.pdf?sheet=blank-run-sheet`)).body, 'blank.pdf')
  for (const label of ['M-in', 'K-in', 'K-out', 'M-out']) expect(blank).toContain(label)

  const csv = Papa.parse<Record<string, string>>(new TextDecoder().decode((await bytes(`/api/events/${eventId}/day.csv?date=${day}`)).body), { header: true, skipEmptyLines: true })
  expect(csv.meta.fields).toContain('Speed (km/h)')
  expect(csv.data.map(r => Number(r.Run))).toEqual(order)
  const line = csv.data.find(r => Number(r.Run) === run.id)!
  expect(line['Speed (km/h)']).toBe(paper.runOrder.find((r: any) => r.runId === run.id).kmh)
  const wb = new ExcelJS.Workbook()
  await wb.xlsx.load(Buffer.from((await bytes(`/api/events/${eventId}/day.xlsx?date=${day}`)).body) as any)
  const rows = wb.getWorksheet(`Runs ${day}`)!
  expect(rows.getRow(1).getCell(14).value).toBe('Speed (km/h)')
  expect(rows.getRow(2).getCell(14).value).toBe(Number(csv.data[0]!['Speed (km/h)']))
  expect(wb.getWorksheet('Start list')!.rowCount).toBe(paper.startList.length + 1)
})

it('names the field of a day that is not a date', async () => {
  const r = await call('GET', `/api/events/${eventId}/paper?date=yesterday`, { cookie })
  expect(r.status).toBe(422)
  expect(r.body.data.issues[0]).toEqual({ path: 'date', message: 'must be a date, YYYY-MM-DD' })
})
