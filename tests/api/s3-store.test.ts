import { createHash, randomBytes } from 'node:crypto'
import { mkdtempSync, rmSync, writeFileSync, existsSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import S3rver from 's3rver'
import { afterAll, beforeAll, expect, it } from 'vitest'
import { S3BlobStore } from '../../server/utils/evidence/blob-store-s3'

// The S3 driver against s3rver, a fake S3 server from npm, started here on a free port.
const dir = mkdtempSync(join(tmpdir(), 'trapline-s3-'))
let server: S3rver
let store: S3BlobStore

beforeAll(async () => {
  server = new S3rver({ port: 0, address: '127.0.0.1', silent: true, directory: dir, configureBuckets: [{ name: 'evidence-test', configs: [] }] })
  const { port } = await server.run() as unknown as { port: number }
  store = new S3BlobStore({ endpoint: `http://127.0.0.1:${port}`, region: 'us-east-1', bucket: 'evidence-test', accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' })
})
afterAll(async () => {
  await server?.close()
  rmSync(dir, { recursive: true, force: true })
})

it('puts a 40 MB file in parts, finds it, streams it back intact, lists and removes it', async () => {
  const bytes = randomBytes(40 * 1024 * 1024)
  const sha = createHash('sha256').update(bytes).digest('hex')
  const tmp = join(dir, 'upload.part')
  writeFileSync(tmp, bytes)
  expect(await store.has(sha)).toBe(false)
  await store.put(sha, tmp, bytes.length, 'video/mp4')
  expect(existsSync(tmp)).toBe(false) // the temporary file is gone once stored
  expect(await store.has(sha)).toBe(true)
  const hash = createHash('sha256')
  for await (const chunk of await store.open(sha)) hash.update(chunk as Buffer)
  expect(hash.digest('hex')).toBe(sha)
  const listed: string[] = []
  for await (const k of store.list()) listed.push(k)
  expect(listed).toEqual([sha])
  await store.remove(sha)
  expect(await store.has(sha)).toBe(false)
}, 60_000)
