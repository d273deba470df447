import { mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs'
import { resolve } from 'node:path'
import type { ProvidedContext } from 'vitest'
import type { TestProject } from 'vitest/node'
import { expectedServerErrors, root, startApp, startCatcher, startPaymentsFake, unexpectedErrors, type Started } from './processes'

// Starts the mail catcher and the built app once for all end-to-end tests, on ports checked when
// they are bound, with folders of this run's own (scripts/test.sh gives each run one), against the
// test database that scripts/test.sh created. Nothing here touches a running npm start or another run.
/** The webhook signing secret the fake signs with and the app checks: a test value, never a real account's. */
export const PAYMENTS_WEBHOOK_SECRET = 'whsec_trapline_test_secret'

/** What the one start gives every e2e project. */
interface Shared {
  provided: ProvidedContext
  stop: () => Promise<void>
}
const shared = globalThis as typeof globalThis & { __traplineE2E?: Promise<Shared>, __traplineE2EUsers?: number }

/**
 * Both e2e projects (the isolated files, run side by side, and the others, one at a time after them) name this
 * setup: the first to run starts the services once for both, each gets the same addresses, and the last to
 * finish stops them.
 */
export default async function setup(project: TestProject) {
  shared.__traplineE2EUsers = (shared.__traplineE2EUsers ?? 0) + 1
  shared.__traplineE2E ??= start()
  const { provided, stop } = await shared.__traplineE2E
  for (const key of Object.keys(provided) as (keyof ProvidedContext)[]) project.provide(key, provided[key])
  return async () => {
    shared.__traplineE2EUsers = (shared.__traplineE2EUsers ?? 1) - 1
    if (shared.__traplineE2EUsers === 0) await stop()
  }
}

async function start(): Promise<Shared> {
  // The tests' own connection is the database owner's; the app connects as trapline_app.
  const databaseUrl = process.env.TEST_DATABASE_URL
  const appDatabaseUrl = process.env.TEST_APP_DATABASE_URL
  const output = process.env.TRAPLINE_OUTPUT_DIR ?? resolve(root, '.output-test')
  const runDir = process.env.TRAPLINE_TEST_DIR ?? resolve(root, `.data/test-run.${process.pid}`)
  if (!databaseUrl || !appDatabaseUrl) throw new Error('TEST_DATABASE_URL is not set: run the tests with npm test')

  const mailDir = resolve(runDir, 'mail')
  const dataDir = resolve(runDir, 'storage')
  for (const dir of [mailDir, dataDir]) {
    rmSync(dir, { recursive: true, force: true })
    mkdirSync(dir, { recursive: true })
  }
  const catcher = await startCatcher(mailDir)
  // The mail-server-down test stops the catcher and starts another on the same ports; it records the
  // new one's pid here, and the teardown stops whichever is running.
  const catcherPidFile = resolve(runDir, 'mail-catcher.pid')
  writeFileSync(catcherPidFile, String(catcher.child.pid))
  const payments = await startPaymentsFake()
  let app: Started
  try {
    app = await startApp(output, {
      NUXT_DATABASE_URL: appDatabaseUrl,
      NUXT_MAIL_PORT: String(catcher.smtpPort),
      NUXT_PUBLIC_INBOX_URL: catcher.inboxUrl,
      NUXT_SEED_DEMO: 'true',
      // New password hashes at scrypt N = 2^10 instead of 2^14: only this test server may (server/plugins/hash-cost.ts).
      NUXT_TEST_SERVER: 'true',
      NUXT_HASH_SCRYPT_COST: '1024',
      NUXT_DATA_DIR: dataDir,
      NUXT_MAIL_RETRY_SECONDS: '1',
      // A small limit for one kind, so that the size check can be tested without gigabytes.
      NUXT_EVIDENCE_LIMITS_OTHER: String(100 * 1024),
      // A small storage quota per team, so that it can be reached in a test.
      NUXT_TEAM_QUOTA_BYTES: String(3 * 1024 * 1024),
      // The payment provider's SDK pointed at the local fake.
      NUXT_PAYMENTS_HOST: '127.0.0.1',
      NUXT_PAYMENTS_PORT: String(payments.port),
      NUXT_PAYMENTS_PROTOCOL: 'http',
      NUXT_PAYMENTS_WEBHOOK_SECRET: PAYMENTS_WEBHOOK_SECRET,
    })
  }
  catch (e) {
    await catcher.stop()
    await payments.stop()
    throw e
  }
  // NUXT_SITE_URL is the address in e-mails and dossiers; the app answers on 127.0.0.1 and localhost.
  const baseUrl = `http://localhost:${app.port}`
  await fetch(`http://127.0.0.1:${payments.port}/_fake/config`, {
    method: 'POST', body: JSON.stringify({ webhook: `http://127.0.0.1:${app.port}/api/payments/webhook` }),
  })
  const provided: ProvidedContext = {
    paymentsUrl: `http://127.0.0.1:${payments.port}`,
    baseUrl,
    inboxUrl: catcher.inboxUrl,
    databaseUrl,
    dataDir,
    serverEnv: JSON.stringify({ databaseUrl: appDatabaseUrl, dataDir, smtpPort: catcher.smtpPort, inboxPort: catcher.port, output, mailDir, runDir, catcherPidFile }),
  }

  const stop = async () => {
    await app.stop()
    await catcher.stop()
    await payments.stop()
    try {
      process.kill(Number(readFileSync(catcherPidFile, 'utf8')), 'SIGTERM')
    }
    catch { /* the same catcher, already stopped */ }
    // An error the server logged and no test said it provokes fails the run.
    const errors = unexpectedErrors(app.log(), expectedServerErrors(runDir))
    if (errors.length) {
      console.log(`--- server log ---\n${app.log()}`)
      // vitest does not fail a run on a teardown error: scripts/test.sh fails it on this file.
      writeFileSync(resolve(runDir, 'unexpected-server-errors'), `${errors.join('\n')}\n`)
      throw new Error(`the server logged ${errors.length} unexpected error line(s), first: ${errors[0]}`)
    }
  }
  return { provided, stop }
}

declare module 'vitest' {
  export interface ProvidedContext {
    baseUrl: string
    inboxUrl: string
    databaseUrl: string
    dataDir: string
    serverEnv: string
    paymentsUrl: string
  }
}
