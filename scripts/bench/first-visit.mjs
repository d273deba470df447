// Bytes on the wire for a timekeeper's first visit of the run sheet (an empty browser cache, signed in),
// as Chromium counts them (encoded body and headers of every response), and for one poll of the live
// results with and without compression. Figures only.
import { mkdtempSync, rmSync } from 'node:fs'
import { request } from 'node:http'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { parseArgs } from 'node:util'
import { chromium } from 'playwright-core'

const { values } = parseArgs({ options: { url: { type: 'string' } } })
const base = values.url

const login = async () => {
  const r = await fetch(`${base}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email: 'timekeeper@trapline.test', password: 'trapline-demo' }),
  })
  return r.headers.getSetCookie().map(c => c.split(';')[0]).join('; ')
}

/** The size of an answer as sent, with the given Accept-Encoding. */
const sentBytes = (path, headers) => new Promise((ok, fail) => {
  const req = request(`${base}${path}`, { headers }, (res) => {
    let n = 0
    res.on('data', c => (n += c.length))
    res.on('end', () => ok(n))
  })
  req.on('error', fail)
  req.end()
})

const cookie = await login()
const events = await (await fetch(`${base}/api/events`, { headers: { cookie } })).json()
// The demo's event: the live-results part of the bench adds events of its own named "Bench …".
const eventId = events.find(e => !e.name.startsWith('Bench')).id
const livePath = `/api/events/${eventId}/live`
const plain = await sentBytes(livePath, { cookie })
const br = await sentBytes(livePath, { cookie, 'accept-encoding': 'br' })
console.log(`one poll of the demo's live results: ${(plain / 1024).toFixed(1)} KiB plain, ${(br / 1024).toFixed(1)} KiB with brotli`)

const profile = mkdtempSync(join(tmpdir(), 'trapline-bench-chromium-'))
const context = await chromium.launchPersistentContext(profile, {
  executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
  headless: true,
  args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking'],
})
try {
  const [name, value] = cookie.split('; ')[0].split('=')
  await context.addCookies([{ name, value, url: base }])
  const page = await context.newPage()
  const cdp = await context.newCDPSession(page)
  await cdp.send('Network.enable')
  let bytes = 0
  let requests = 0
  const urls = new Map()
  cdp.on('Network.responseReceived', e => urls.set(e.requestId, `${e.response.url.replace(base, '')} ${e.response.headers['content-encoding'] ?? e.response.headers['Content-Encoding'] ?? ''}`))
  const sizes = []
  cdp.on('Network.loadingFinished', (e) => {
    bytes += e.encodedDataLength
    requests++
    sizes.push([e.encodedDataLength, urls.get(e.requestId)])
  })
  await page.goto(`${base}/events/${eventId}/run-sheet`, { waitUntil: 'networkidle' })
  await page.waitForSelector('html[data-hydrated="true"]')
  console.log(`first visit of the run sheet: ${requests} responses, ${(bytes / 1000).toFixed(1)} kB `
    + `(${(bytes / 1024).toFixed(1)} KiB) on the wire, ${bytes < 200_000 ? 'under' : 'OVER'} 200 kB; the service `
    + 'worker then precaches the rest of the app in the background')
  if (process.env.BENCH_DETAIL) for (const [n, u] of sizes.sort((a, b) => b[0] - a[0])) console.log(`  ${(n / 1024).toFixed(1)} KiB ${u}`)
}
finally {
  await context.close()
  rmSync(profile, { recursive: true, force: true })
}
