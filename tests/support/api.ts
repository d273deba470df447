import { $fetch as testFetch, setup } from '@nuxt/test-utils/e2e'
import { inject } from 'vitest'
import demo from '../../server/database/demo-people.json'

/** Every API test targets the one server the global setup started, through @nuxt/test-utils. */
export async function useTestServer() {
  await setup({ host: inject('baseUrl') })
}

export { testFetch }

let base: string | undefined
/**
 * Points this test file's helpers (call, login, the test event…) at another app server, as the test of
 * several servers does with an installation of its own. Each test file has its own copy of this module.
 */
export const useBaseUrl = (other: string) => {
  base = other
}
/** An address on the test server; usable in any hook (the test-utils context exists only inside tests). */
export const url = (path: string) => new URL(path, base ?? inject('baseUrl')).toString()
export const DEMO_PASSWORD = demo.password
export const demoEmail = (role: string) => demo.people.find(p => (role === 'admin' ? p.admin : p.role === role))!.email

export interface Reply<T = any> {
  status: number
  body: T
  headers: Headers
}

/** A raw request: the status and body whatever they are, with an optional session cookie. */
export async function call<T = any>(method: string, path: string, options: { body?: unknown, cookie?: string, raw?: string, now?: Date } = {}): Promise<Reply<T>> {
  const headers: Record<string, string> = {}
  if (options.cookie) headers.cookie = options.cookie
  // The instant the test server judges periods by (a protest period is not waited out in a test).
  if (options.now) headers['x-trapline-now'] = options.now.toISOString()
  let body: string | undefined
  if (options.raw !== undefined || options.body !== undefined) {
    body = options.raw ?? JSON.stringify(options.body)
    headers['content-type'] = 'application/json'
  }
  const r = await fetch(url(path), { method, headers, body, redirect: 'manual' })
  if (r.headers.get('content-type')?.startsWith('text/event-stream')) {
    await r.body?.cancel() // a stream of live results never ends: its status and headers are the answer
    return { status: r.status, body: null as T, headers: r.headers }
  }
  const text = await r.text()
  let parsed: unknown = text
  try {
    parsed = text ? JSON.parse(text) : null
  }
  catch { /* not JSON */ }
  return { status: r.status, body: parsed as T, headers: r.headers }
}

export async function login(email: string, password = DEMO_PASSWORD): Promise<string> {
  const r = await call('POST', '/api/auth/login', { body: { email, password } })
  if (r.status !== 200) throw new Error(`sign-in of ${email} failed: ${r.status} ${JSON.stringify(r.body)}`)
  return r.headers.getSetCookie().map(c => c.split(';')[0]).join('; ')
}

interface CaughtMail { id: string, to: string, subject: string, text: string }

/** The newest message the mail catcher holds for an address, asking again until it is there (15 s at most). */
export async function mailTo(address: string, subjectHas = ''): Promise<CaughtMail> {
  const until = Date.now() + 15_000
  while (Date.now() < until) {
    const list = await (await fetch(`${inject('inboxUrl')}/api/messages`)).json() as CaughtMail[]
    const hit = list.find(m => m.to.includes(address) && m.subject.includes(subjectHas))
    if (hit) return hit
    await new Promise(r => setTimeout(r, 50))
  }
  throw new Error(`no mail to ${address} with "${subjectHas}" within 15 s`)
}

export const linkToken = (text: string) => /set-password\?token=([\w-]+)/.exec(text)?.[1] ?? ''

export const unique = (prefix: string) => `${prefix}-${Date.now().toString(36)}-${Math.random().toString(36).slice(2, 7)}@example.test`

/** The demo event, found by its name (never by its position or id). */
export const DEMO_EVENT_NAME = 'Tamsel Flat Electric Record Days'
export async function demoEventId(cookie: string): Promise<number> {
  const events = (await call('GET', '/api/events', { cookie })).body as { id: number, name: string }[]
  return events.find(e => e.name === DEMO_EVENT_NAME)!.id
}

let demoEventIdCache: Promise<number> | undefined
/** A page or route of the demo event: `await demoEventPath('/run-sheet')` is `/events/<its id>/run-sheet`. */
export async function demoEventPath(tail = '') {
  demoEventIdCache ??= login(demoEmail('organiser')).then(demoEventId)
  return `/events/${await demoEventIdCache}${tail}`
}

/** The demo's record in the public record book: the fully streamlined electric class over the flying mile. */
export async function demoMileRecord() {
  const book = (await call('GET', '/api/record-book')).body.records as { class: string, distance: string, dossierUrl: string }[]
  return book.find(r => r.class === 'Electric, fully streamlined' && r.distance === 'Flying mile')!
}

/**
 * A fresh person invited to an event (the demo's unless told) by its organiser, with a password set
 * through the link: a record of the test's own (an official's statements, say, touch no other test's).
 */
export async function invitedPerson(
  role = 'official',
  password = 'first-password-1',
  name = 'Test Person',
  at: { eventId?: number, organiser?: string, teamName?: string } = {},
) {
  const organiser = at.organiser ?? await login(demoEmail('organiser'))
  const eventId = at.eventId ?? await demoEventId(organiser)
  const email = unique(role)
  const body = { email, name, role, ...(at.teamName ? { teamName: at.teamName } : {}) }
  const r = await call('POST', `/api/events/${eventId}/people`, { cookie: organiser, body })
  if (r.status !== 201) throw new Error(`invitation refused: ${JSON.stringify(r.body)}`)
  return { email, password, name, ...await setPasswordByLink(email, password) }
}

/** Sets a password through the link of the invitation e-mail just sent, and signs in. */
export async function setPasswordByLink(email: string, password: string) {
  const token = linkToken((await mailTo(email, 'invited')).text)
  const set = await call('POST', '/api/auth/token', { body: { token, password } })
  if (set.status !== 200) throw new Error(`password not set: ${JSON.stringify(set.body)}`)
  return { token, cookie: await login(email, password) }
}
