import { spawn } from 'node:child_process'
import { cpSync, mkdirSync, writeFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { call, demoMileRecord, useTestServer } from '../support/api'
import { startApp } from '../support/processes'

await useTestServer()
const env = JSON.parse(inject('serverEnv'))
const root = resolve(import.meta.dirname, '../..')
let pdf: Uint8Array
let keysFile = ''

/** Runs one of the project's scripts with tsx, as `npm run` does; its exit code and what it printed. */
function script(name: string, args: string[], extraEnv: Record<string, string> = {}) {
  return new Promise<{ code: number | null, out: string }>((done, fail) => {
    const p = spawn(resolve(root, 'node_modules/.bin/tsx'), [resolve(root, 'scripts', name), ...args], {
      cwd: root,
      env: { ...process.env, ...extraEnv },
    })
    let out = ''
    p.stdout.on('data', (c: Buffer) => (out += c.toString('utf8')))
    p.stderr.on('data', (c: Buffer) => (out += c.toString('utf8')))
    p.on('error', fail)
    p.on('close', code => done({ code, out }))
  })
}

beforeAll(async () => {
  // The demo's ratified dossier (public copy), sealed by the test server's key at its start.
  pdf = new Uint8Array(await (await fetch((await demoMileRecord()).dossierUrl)).arrayBuffer())
  keysFile = resolve(env.runDir, 'published-keys.json')
  writeFileSync(keysFile, JSON.stringify((await call('GET', '/api/seal')).body))
})

describe('the offline checker', () => {
  it('checks a dossier with only the published keys, and names the part that fails', async () => {
    const file = resolve(env.runDir, 'offline.pdf')
    writeFileSync(file, pdf)
    const good = await script('verify.ts', [file, '--keys', keysFile])
    expect(good.code, good.out).toBe(0)
    expect(good.out).toContain('✓ PDF signature (whole file): valid')
    expect(good.out).toContain('✓ Ed25519 seal over manifest.json: valid')
    expect(good.out).toContain('INTACT')
    // One byte of the file changed (inside the document information's title): the PDF signature fails.
    const bytes = new Uint8Array(pdf)
    const at = Buffer.from(bytes).toString('latin1').indexOf('/Title <') + 20
    bytes[at] = bytes[at] === 0x30 ? 0x31 : 0x30
    writeFileSync(file, bytes)
    const bad = await script('verify.ts', [file, '--keys', keysFile])
    expect(bad.code).toBe(1)
    expect(bad.out).toContain('✕ PDF signature (whole file): the file was changed after it was signed')
    expect(bad.out).toContain('NOT INTACT')
    // Keys of another installation: neither the seal nor the signature is by a published key.
    const other = resolve(env.runDir, 'other-keys.json')
    writeFileSync(other, JSON.stringify({ keys: [{ keyId: 'x', publicKeyPem: (await import('node:crypto')).generateKeyPairSync('ed25519').publicKey.export({ type: 'spki', format: 'pem' }), certificateSha256: 'none', retiredAt: null }] }))
    writeFileSync(file, pdf)
    const foreign = await script('verify.ts', [file, '--keys', other])
    expect(foreign.code).toBe(1)
    expect(foreign.out).toContain('✕ Ed25519 seal over manifest.json: no published key seals this manifest')
    expect(foreign.out).toContain('not one of the published keys')
  })
})

describe('managed keys', { shuffle: false }, () => {
  let second: Awaited<ReturnType<typeof startApp>> | undefined
  afterAll(() => second?.stop())

  it('a server that finds no key where keys were used before refuses to start', async () => {
    const empty = resolve(env.runDir, 'empty-seal')
    mkdirSync(empty, { recursive: true })
    const outcome = await startApp(env.output, {
      NUXT_DATABASE_URL: env.databaseUrl,
      NUXT_DATA_DIR: resolve(env.runDir, 'no-key-server'),
      NUXT_SEAL_DIR: empty,
      NUXT_MAIL_PORT: String(env.smtpPort),
      NUXT_SEED_DEMO: 'true',
    }).then(
      async (server) => {
        await expect.poll(() => server.child.exitCode, { timeout: 15_000 }).toBe(1)
        return server.log()
      },
      (e: Error) => e.message,
    )
    expect(outcome).toContain('refusing to start: no seal key in')
  })

  it('a server that is not the test server refuses a password hash cheaper than scrypt N = 2^14', async () => {
    const outcome = await startApp(env.output, {
      NUXT_DATABASE_URL: env.databaseUrl,
      NUXT_DATA_DIR: resolve(env.runDir, 'cheap-hash-server'),
      NUXT_MAIL_PORT: String(env.smtpPort),
      NUXT_HASH_SCRYPT_COST: '1024',
      NUXT_TEST_SERVER: 'false',
    }).then(
      async (server) => {
        await expect.poll(() => server.child.exitCode, { timeout: 15_000 }).toBe(1)
        return server.log()
      },
      (e: Error) => e.message,
    )
    expect(outcome).toContain('refusing to start: NUXT_HASH_SCRYPT_COST=1024 is below 16384')
  })

  it('after a rotation the new key seals, and a dossier sealed before still verifies with the retired one', async () => {
    const before = (await call('GET', '/api/seal')).body
    // A copy of the test server's key set, rotated by the project's command, for a second server.
    const dir = resolve(env.runDir, 'rotated-seal')
    cpSync(resolve(env.dataDir, 'seal'), dir, { recursive: true })
    const rotated = await script('seal-rotate.ts', ['--dir', dir])
    expect(rotated.code, rotated.out).toBe(0)
    expect(rotated.out).toContain(`retired key ${before.fingerprint}`)
    second = await startApp(env.output, {
      NUXT_DATABASE_URL: env.databaseUrl,
      NUXT_DATA_DIR: resolve(env.runDir, 'rotated-server'),
      NUXT_SEAL_DIR: dir,
      NUXT_MAIL_PORT: String(env.smtpPort),
      NUXT_SEED_DEMO: 'true', // the database holds the demo already: nothing is added
    })
    const base = `http://127.0.0.1:${second.port}`
    const seal = await (await fetch(`${base}/api/seal`)).json()
    expect(seal.fingerprint).not.toBe(before.fingerprint)
    expect(seal.keys.find((k: any) => k.keyId === seal.fingerprint).retiredAt).toBeNull()
    expect(seal.keys.find((k: any) => k.keyId === before.fingerprint).retiredAt).not.toBeNull()
    const body = new FormData()
    body.append('file', new Blob([pdf]), 'old.pdf')
    const report = await (await fetch(`${base}/api/dossiers/verify`, { method: 'POST', body })).json()
    expect(report.sealValid, report.message).toBe(true)
    expect(report.keyFingerprint).toBe(before.fingerprint)
    expect(report.message).toContain('(retired since)')
  })
})
