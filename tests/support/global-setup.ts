import { spawn, type ChildProcess } from 'node:child_process'
import { readFileSync, rmSync, writeFileSync } from 'node:fs'
import { createServer } from 'node:net'
import { resolve } from 'node:path'
import type { TestProject } from 'vitest/node'

// Starts the mail catcher and the built app once for all end-to-end tests, on free ports, against
// the test database that scripts/test.sh created. Nothing here touches a running npm start.
const root = resolve(import.meta.dirname, '../..')

const freePort = () => new Promise<number>((ok, fail) => {
  const s = createServer()
  s.once('error', fail)
  s.listen(0, '127.0.0.1', () => {
    const { port } = s.address() as { port: number }
    s.close(() => ok(port))
  })
})

async function waitFor(url: string, child: ChildProcess, log: () => string, timeoutMs = 60_000) {
  const until = Date.now() + timeoutMs
  while (Date.now() < until) {
    if (child.exitCode !== null) throw new Error(`the server exited early:\n${log()}`)
    try {
      const r = await fetch(url)
      if (r.ok) return
    }
    catch { /* not up yet */ }
    await new Promise(r => setTimeout(r, 200))
  }
  throw new Error(`${url} did not answer within ${timeoutMs} ms:\n${log()}`)
}

export default async function setup(project: TestProject) {
  const databaseUrl = process.env.TEST_DATABASE_URL
  const output = process.env.TRAPLINE_OUTPUT_DIR ?? resolve(root, '.output-test')
  if (!databaseUrl) throw new Error('TEST_DATABASE_URL is not set: run the tests with npm test')

  const [appPort, smtpPort, inboxPort] = [await freePort(), await freePort(), await freePort()]
  const mailDir = resolve(root, '.data/test-mail')
  rmSync(mailDir, { recursive: true, force: true })
  const dataDir = resolve(root, '.data/test-storage')
  rmSync(dataDir, { recursive: true, force: true })
  const catcher = spawn(process.execPath, ['scripts/mail-catcher.mjs', '--smtp', String(smtpPort), '--http', String(inboxPort), '--dir', mailDir], { cwd: root, stdio: 'ignore' })
  // A test may stop the catcher and start another (mail-server-down test); it records the new pid here.
  const catcherPidFile = resolve(root, '.data/test-mail.pid')
  writeFileSync(catcherPidFile, String(catcher.pid))

  let serverLog = ''
  const server = spawn(process.execPath, [resolve(output, 'server/index.mjs')], {
    cwd: root,
    env: {
      ...process.env,
      PORT: String(appPort),
      HOST: '127.0.0.1',
      NUXT_DATABASE_URL: databaseUrl,
      NUXT_SESSION_PASSWORD: 'test-session-password-at-least-32-characters-long',
      NUXT_MAIL_PORT: String(smtpPort),
      NUXT_SITE_URL: `http://localhost:${appPort}`,
      NUXT_PUBLIC_INBOX_URL: `http://127.0.0.1:${inboxPort}`,
      NUXT_SEED_DEMO: 'true',
      NUXT_DATA_DIR: dataDir,
      NUXT_MAIL_RETRY_SECONDS: '1',
      // A small limit for one kind, so that the size check can be tested without gigabytes.
      NUXT_EVIDENCE_LIMITS_OTHER: String(100 * 1024),
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  })
  server.stdout!.on('data', (d) => {
    serverLog += d
  })
  server.stderr!.on('data', (d) => {
    serverLog += d
  })

  const baseUrl = `http://localhost:${appPort}`
  await waitFor(`${baseUrl}/api/health`, server, () => serverLog)
  await waitFor(`http://127.0.0.1:${inboxPort}/api/messages`, catcher, () => 'mail catcher did not start')

  project.provide('baseUrl', baseUrl)
  project.provide('inboxUrl', `http://127.0.0.1:${inboxPort}`)
  project.provide('databaseUrl', databaseUrl)
  project.provide('dataDir', dataDir)
  project.provide('serverEnv', JSON.stringify({ databaseUrl, dataDir, smtpPort, inboxPort, output, mailDir, catcherPidFile }))

  return async () => {
    server.kill('SIGTERM')
    catcher.kill('SIGTERM')
    try {
      process.kill(Number(readFileSync(catcherPidFile, 'utf8')), 'SIGTERM')
    }
    catch { /* already stopped */ }
    if (serverLog.includes('[nitro] [unhandled error]') || (/\n\s+at .+\n/.test(serverLog) && serverLog.includes('Error'))) {
      console.log('--- server log ---\n' + serverLog)
    }
  }
}

declare module 'vitest' {
  export interface ProvidedContext {
    baseUrl: string
    inboxUrl: string
    databaseUrl: string
    dataDir: string
    serverEnv: string
  }
}
