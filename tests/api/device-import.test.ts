import { beforeAll, expect, it } from 'vitest'
import { call, url, useTestServer } from '../support/api'
import { clearedEntry } from '../support/entries'
import { form, pdf } from '../support/files'
import { pdfText } from '../support/pdf-tools'
import { makeReady } from '../support/ready-attempt'
import { newTestEvent, type TestEvent } from '../support/test-event'
import { addDays, localDate, localMidnight } from '#shared/rules/zoned'
import { eventClockTime } from '../support/runs'

await useTestServer()

// A timing device's own event list (channel, time of day at 1/10 000 s) read through a channel map. The
// layout (RFC 4180 text with a semicolon separator, the common European-locale setting of such devices) and
// the runs are invented for the test; the speed follows from v = d / t with 1 km/h = 1/3.6 m/s (SI).

/** A whole-hour zone in which it is between 00:30 and 01:30 now: the last midnight is 30 to 90 min ago. */
function justAfterMidnight() {
  const now = new Date()
  const hours = now.getUTCMinutes() >= 30 ? 0 : 1
  const offset = ((((hours - now.getUTCHours() + 12) % 24) + 24) % 24) - 12
  return offset === 0 ? 'UTC' : `Etc/GMT${offset > 0 ? '-' : '+'}${Math.abs(offset)}`
}

let event: TestEvent
let runs: { out: number, back: number }
let midnight = 0
let yesterday = ''

beforeAll(async () => {
  const zone = justAfterMidnight()
  event = await newTestEvent('intl-motorcycle', zone)
  const entryId = await clearedEntry(event.eventId, 'Channel Sprite', {}, {
    team: event.cookie.team, scrutineer: event.cookie.scrutineer, scrutineerPassword: 'first-password-1',
  })
  const today = localDate(Date.now(), zone)
  yesterday = addDays(today, -1)
  midnight = localMidnight(today, zone)
  const start = async (direction: 'out' | 'back', atMs: number) => {
    const r = await call('POST', `/api/events/${event.eventId}/runs`, {
      cookie: event.cookie.timekeeper,
      body: { entryId, direction, startedAt: new Date(atMs).toISOString() },
    })
    expect(r.status, JSON.stringify(r.body)).toBe(201)
    return r.body.id as number
  }
  // Out at 23:58 yesterday, back at 00:10 today, in the event's zone.
  runs = { out: await start('out', midnight - 2 * 60_000), back: await start('back', midnight + 10 * 60_000) }
})

const FILE = [
  'Seq;Channel;Time',
  '1;1;23:59:55.0000', // out: K-in, before midnight
  '2;2;00:00:04.0000', // out: K-out after midnight, 9.0000 s later
  '3;9;00:05:00.0000', // a channel the map does not have
  '4;2;00:11:00.0000', // back: K-out first
  '5;1;00:11:10.0000', // back: K-in, 10.0000 s later
].join('\n')

async function storeFile(text: string, name = 'beam-set-a.txt') {
  const r = await fetch(url(`/api/events/${event.eventId}/evidence`), {
    method: 'POST',
    headers: { cookie: event.cookie.timekeeper },
    body: form({ kind: 'data-log', timingSystemId: event.systems.primary }, { name, bytes: new TextEncoder().encode(text), type: 'text/plain' }),
  })
  expect(r.status).toBe(201)
  return await r.json() as { id: number, sha256: string }
}

const layout = () => ({
  delimiter: ';',
  header: true,
  columns: { channel: 'Channel', time: 'Time', sequence: 'Seq' },
  channels: [{ channel: '1', trapId: event.traps['K-in'] }, { channel: '2', trapId: event.traps['K-out'] }],
})
const importFile = (evidenceId: number, commit: boolean, extra: Record<string, unknown> = {}) =>
  call('POST', `/api/events/${event.eventId}/device-imports`, {
    cookie: event.cookie.timekeeper,
    body: { systemId: event.systems.primary, evidenceId, firstDay: yesterday, layout: layout(), commit, ...extra },
  })

it('shows two runs\' passings over midnight and an unknown channel before writing anything', async () => {
  const file = await storeFile(FILE)
  const preview = await importFile(file.id, false)
  expect(preview.status, JSON.stringify(preview.body)).toBe(200)
  expect(preview.body.written).toBe(0)
  expect(preview.body.runs.map((r: any) => [r.runId, r.passings.map((p: any) => p.line)])).toEqual([
    [runs.out, [2, 3]],
    [runs.back, [5, 6]],
  ])
  // The K-out of the out run is after midnight: on today's date, 4 s after it.
  expect(preview.body.runs[0].passings[1].at).toBe(new Date(midnight + 4000).toISOString())
  expect(preview.body.unmatched).toEqual([{ line: 4, channel: '9', time: '00:05:00.0000', reason: 'channel 9 is not in the channel map' }])
  const live = await call('GET', `/api/events/${event.eventId}/live`, { cookie: event.cookie.team })
  expect(live.body[0].runs.every((r: any) => r.official === null)).toBe(true)
})

it('writes the passings given to runs, each naming the file, keeps the layout, and refuses the same file twice', async () => {
  const file = await storeFile(FILE, 'beam-set-a-again.txt')
  const written = await importFile(file.id, true)
  expect(written.status, JSON.stringify(written.body)).toBe(201)
  expect(written.body.written).toBe(4)
  // 1000 m in 9.0000 s = 400.000 km/h; in 10.0000 s = 360.000 km/h (v = d / t, 1 km/h = 1/3.6 m/s).
  const live = await call('GET', `/api/events/${event.eventId}/live`, { cookie: event.cookie.team })
  const byRun = new Map(live.body.flatMap((a: any) => a.runs).map((r: any) => [r.id, r.official?.kmh]))
  expect(byRun.get(runs.out)).toBe('400.000')
  expect(byRun.get(runs.back)).toBe('360.000')
  const sheet = await call('GET', `/api/events/${event.eventId}/run-sheet`, { cookie: event.cookie.timekeeper })
  const imported = sheet.body.history.filter((g: any) => g.sourceEvidenceId === file.id)
  expect(imported).toHaveLength(4)
  expect(sheet.body.deviceLayouts).toEqual([{ systemId: event.systems.primary, layout: { ...layout(), columns: { channel: 'Channel', time: 'Time', sequence: 'Seq' } } }])
  // The same passings again: each trap already has its time, so every one is listed and nothing is written.
  const again = await importFile(file.id, true, { layout: undefined })
  expect(again.status).toBe(422)
  expect(again.body.data.issues[0]).toEqual({ path: 'evidenceId', message: 'no passing in this file can be given to a run' })
})

it('names the field when the file is not a data log or a channel maps to no trap of the event', async () => {
  const certificate = await fetch(url(`/api/events/${event.eventId}/evidence`), {
    method: 'POST',
    headers: { cookie: event.cookie.timekeeper },
    body: form({ kind: 'calibration-certificate', timingSystemId: event.systems.primary }, { name: 'calibration.pdf', bytes: pdf('calibration') }),
  })
  expect(certificate.status).toBe(201)
  const notLog = await importFile((await certificate.json()).id, false)
  expect(notLog.status).toBe(422)
  expect(notLog.body.data.issues[0]).toEqual({ path: 'evidenceId', message: 'is not a data log: store the device file as one' })
  const file = await storeFile(FILE, 'third.txt')
  const bad = await importFile(file.id, false, { layout: { ...layout(), channels: [{ channel: '1', trapId: 2_000_000 }] } })
  expect(bad.status).toBe(422)
  expect(bad.body.data.issues[0]).toEqual({ path: 'layout.channels.0.trapId', message: 'no such trap at this event' })
})

it('names the device file and its SHA-256 beside each reading it gave, in the sealed dossier', async () => {
  // An entry of its own, inspected now, and two runs after that: out, and back nine minutes later. The device
  // gives the primary's times; the backup's are typed, the same to 1/1000 s. 1000 m in 8.9000 s is
  // 404.494 km/h (truncated), over the test event's record of 400.000 km/h.
  const entryId = await clearedEntry(event.eventId, 'Sealed Sprite', {}, {
    team: event.cookie.team, scrutineer: event.cookie.scrutineer, scrutineerPassword: 'first-password-1',
  })
  const zone = event.timeZone
  const out = Math.ceil(Date.now() / 60_000) * 60_000 + 60_000
  const back = out + 9 * 60_000
  const start = async (direction: 'out' | 'back', atMs: number) => (await call('POST', `/api/events/${event.eventId}/runs`, {
    cookie: event.cookie.timekeeper, body: { entryId, direction, startedAt: new Date(atMs).toISOString() },
  })).body.id as number
  const ids = { out: await start('out', out), back: await start('back', back) }
  const clockAt = (ms: number) => eventClockTime(ms, zone)
  const passings = [[1, out + 60_000], [2, out + 68_900], [2, back + 60_000], [1, back + 68_900]] as const
  const text = ['Seq;Channel;Time', ...passings.map(([ch, ms], i) => `${i + 1};${ch};${clockAt(ms)}`)].join('\n')
  const file = await storeFile(text, 'sealed-sprite-device.txt')
  const written = await importFile(file.id, true, { firstDay: localDate(out + 60_000, zone) })
  expect(written.status, JSON.stringify(written.body)).toBe(201)
  expect(written.body.written).toBe(4)
  for (const [i, [ch, ms]] of passings.entries()) {
    const r = await call('POST', `/api/runs/${i < 2 ? ids.out : ids.back}/readings`, {
      cookie: event.cookie.timekeeper,
      body: { trapId: event.traps[ch === 1 ? 'K-in' : 'K-out'], systemId: event.systems.backup, time: clockAt(ms).slice(0, -1) },
    })
    expect(r.status, JSON.stringify(r.body)).toBe(201)
  }
  const live = (await call('GET', `/api/events/${event.eventId}/live`, { cookie: event.cookie.team })).body
  const attempt = live.find((a: any) => a.runs.some((r: any) => r.id === ids.out))
  expect(attempt.result.kmh).toBe('404.494')
  await makeReady(event, attempt.id, [ids.out, ids.back], entryId)
  const issued = await call('POST', `/api/attempts/${attempt.id}/dossiers`, { cookie: event.cookie.team })
  expect(issued.status, JSON.stringify(issued.body)).toBe(201)
  const bytes = new Uint8Array(await (await fetch(url(`/api/dossiers/${issued.body.id}/pdf`), { headers: { cookie: event.cookie.team } })).arrayBuffer())
  const printed = await pdfText(bytes, 'device-dossier.pdf')
  expect(printed).toContain(`from the device file sealed-sprite-device.txt, SHA-256 ${file.sha256.slice(0, 16)}`)
  // The file itself in the evidence list, by its hash (the table wraps a hash over two lines: its first half).
  expect(printed.replace(/\s/g, '')).toContain(`sealed-sprite-device.txt88B${file.sha256.slice(0, 32)}`)
})
