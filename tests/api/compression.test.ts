import { request } from 'node:http'
import { brotliDecompressSync, gunzipSync } from 'node:zlib'
import { expect, inject, it } from 'vitest'
import { call, demoEventPath, login, useTestServer } from '../support/api'

await useTestServer()

// Content codings of HTTP (RFC 9110, 8.4.1): the server compresses when the request's Accept-Encoding
// lists the coding, says which in Content-Encoding and varies its answer on Accept-Encoding (12.5.5).
function raw(path: string, headers: Record<string, string>) {
  return new Promise<{ status: number, headers: Record<string, string | string[] | undefined>, body: Buffer }>((ok, fail) => {
    const req = request(new URL(path, inject('baseUrl')), { headers }, (res) => {
      const chunks: Buffer[] = []
      res.on('data', c => chunks.push(c))
      res.on('end', () => ok({ status: res.statusCode!, headers: res.headers, body: Buffer.concat(chunks) }))
    })
    req.on('error', fail)
    req.end()
  })
}

it('sends the live results compressed to a client that takes brotli or gzip, and plain to one that does not', async () => {
  const cookie = await login('timekeeper@trapline.test')
  const path = `/api${await demoEventPath('/live')}`
  const plain = await raw(path, { cookie })
  expect(plain.status).toBe(200)
  expect(plain.headers['content-encoding']).toBeUndefined()
  const br = await raw(path, { cookie, 'accept-encoding': 'br, gzip' })
  expect(br.headers['content-encoding']).toBe('br')
  expect(String(br.headers.vary)).toMatch(/accept-encoding/i)
  expect(brotliDecompressSync(br.body).toString()).toBe(plain.body.toString())
  expect(br.body.length).toBeLessThan(plain.body.length / 3)
  const gz = await raw(path, { cookie, 'accept-encoding': 'gzip' })
  expect(gz.headers['content-encoding']).toBe('gzip')
  expect(JSON.parse(gunzipSync(gz.body).toString())).toEqual((await call('GET', path, { cookie })).body)
})

it('serves the built scripts precompressed, and a page\'s HTML compressed', async () => {
  const page = await raw('/login', { 'accept-encoding': 'br' })
  expect(page.headers['content-encoding']).toBe('br')
  const html = brotliDecompressSync(page.body).toString()
  const script = /\/_nuxt\/[\w.-]+\.js/.exec(html)![0]
  const asset = await raw(script, { 'accept-encoding': 'br, gzip' })
  expect(asset.status).toBe(200)
  expect(asset.headers['content-encoding']).toBe('br')
  const plainAsset = await raw(script, {})
  expect(brotliDecompressSync(asset.body).equals(plainAsset.body)).toBe(true)
})

it('answers a revalidation with an empty 304', async () => {
  const cookie = await login('timekeeper@trapline.test')
  const path = `/api${await demoEventPath('/live')}`
  const first = await raw(path, { cookie, 'accept-encoding': 'br' })
  const again = await raw(path, { cookie, 'accept-encoding': 'br', 'if-none-match': String(first.headers.etag) })
  expect(again.status).toBe(304)
  expect(again.body.length).toBe(0)
})

it('sends a page that is not there as a readable page with the site\'s header, to a browser that takes brotli', async () => {
  // A 404 answer's body must be what its headers say it is (RFC 9110, 8.4): once it reached the browser
  // compressed twice, and showed as a network error instead of the page.
  const missing = await raw('/no-such-page', { 'accept': 'text/html', 'accept-encoding': 'br, gzip' })
  expect(missing.status).toBe(404)
  const html = missing.headers['content-encoding'] === 'br'
    ? brotliDecompressSync(missing.body).toString()
    : missing.headers['content-encoding'] === 'gzip' ? gunzipSync(missing.body).toString() : missing.body.toString()
  expect(html).toContain('There is no page at this address')
  expect(html).toContain('aria-label="Main"')
})
