import { spawn, type ChildProcess } from 'node:child_process'
import { createServer } from 'node:net'
import { appendFileSync, existsSync, readFileSync } from 'node:fs'
import { resolve } from 'node:path'

export const root = resolve(import.meta.dirname, '../..')

/** A port the system says is free now; callers start on it and retry with another if it was taken meanwhile. */
export const freePort = () => new Promise<number>((ok, fail) => {
  const s = createServer()
  s.once('error', fail)
  s.listen(0, '127.0.0.1', () => {
    const { port } = s.address() as { port: number }
    s.close(() => ok(port))
  })
})

export interface Started {
  child: ChildProcess
  port: number
  log: () => string
  stop: () => Promise<void>
}

async function answers(url: string, child: ChildProcess, timeoutMs: number, log: () => string) {
  const until = Date.now() + timeoutMs
  while (Date.now() < until) {
    if (child.exitCode !== null || child.signalCode !== null) return false
    if (await fetch(url).then(r => r.ok, () => false)) return true
    await new Promise(r => setTimeout(r, 100))
  }
  throw new Error(`${url} did not answer within ${timeoutMs} ms; its output ends:\n${log().slice(-3000)}`)
}

/**
 * Starts a process that listens on a port it is given, and waits until `readyPath` answers. A port
 * taken between choosing and binding makes the process exit early: it is started again on another.
 */
export async function startListening(
  command: (port: number) => Promise<{ args: string[], env?: NodeJS.ProcessEnv }> | { args: string[], env?: NodeJS.ProcessEnv },
  readyPath: string,
  timeoutMs = 60_000,
): Promise<Started> {
  let lastLog = ''
  for (let attempt = 0; attempt < 5; attempt++) {
    const port = await freePort()
    const { args, env } = await command(port)
    const child = spawn(process.execPath, args, { cwd: root, env: env ?? process.env, stdio: ['ignore', 'pipe', 'pipe'] })
    let log = ''
    child.stdout!.on('data', d => (log += d))
    child.stderr!.on('data', d => (log += d))
    if (await answers(`http://127.0.0.1:${port}${readyPath}`, child, timeoutMs, () => log)) {
      const stop = async () => {
        if (child.exitCode !== null || child.signalCode !== null) return
        const exited = new Promise(r => child.once('exit', r))
        child.kill('SIGTERM')
        await exited
      }
      return { child, port, log: () => log, stop }
    }
    lastLog = log
  }
  throw new Error(`could not start a process on a free port after 5 tries:\n${lastLog}`)
}

export const SESSION_PASSWORD = 'test-session-password-at-least-32-characters-long'

/** The built app on a port of its own, against the given database and data folder. */
export function startApp(output: string, env: Record<string, string>) {
  // The app never sees the owner's connection or password: only what it is given.
  const { TEST_DATABASE_URL: _owner, PGPASSWORD: _password, ...inherited } = process.env
  return startListening(port => ({
    args: [resolve(output, 'server/index.mjs')],
    env: {
      ...inherited,
      PORT: String(port),
      HOST: '127.0.0.1',
      NUXT_SESSION_PASSWORD: SESSION_PASSWORD,
      NUXT_SITE_URL: `http://localhost:${port}`,
      ...env,
    },
  }), '/api/health')
}

/** The mail catcher: SMTP on the given port (or one of its own), its inbox over HTTP on a free one. */
export async function startCatcher(mailDir: string, smtpPort?: number) {
  let smtp = 0
  const catcher = await startListening(async (port) => {
    smtp = smtpPort ?? (await freePort())
    return { args: ['scripts/mail-catcher.mjs', '--smtp', String(smtp), '--http', String(port), '--dir', mailDir] }
  }, '/api/messages')
  return { ...catcher, smtpPort: smtp, inboxUrl: `http://127.0.0.1:${catcher.port}` }
}

/** Lines of a server log that show an error, less those a test said it provokes (see expectServerError). */
export function unexpectedErrors(log: string, expected: RegExp[] = []) {
  return log
    .split('\n')
    .filter(l => /\[nitro\] \[unhandled error\]|^\s*(Type|Reference|Range|Syntax)?Error\b/.test(l))
    .filter(l => !expected.some(e => e.test(l)))
}

/**
 * A test that provokes a server error on purpose says so here (a pattern of the logged line), so
 * that the run does not fail on it; every other logged error fails the run.
 */
export function expectServerError(runDir: string, pattern: RegExp) {
  appendFileSync(resolve(runDir, 'expected-errors'), `${pattern.source}\n`)
}
export const expectedServerErrors = (runDir: string) => {
  const file = resolve(runDir, 'expected-errors')
  return existsSync(file) ? readFileSync(file, 'utf8').split('\n').filter(Boolean).map(p => new RegExp(p)) : []
}

/** The payment provider's local fake (scripts/payments-fake.mjs), signing webhooks with the tests' secret. */
export const startPaymentsFake = () => startListening(port => ({
  args: ['scripts/payments-fake.mjs', '--port', String(port), '--secret', 'whsec_trapline_test_secret'],
}), '/_fake/ready')
