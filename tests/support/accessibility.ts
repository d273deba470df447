import { readFileSync } from 'node:fs'
import { createRequire } from 'node:module'
import type { AxeResults, RunOptions } from 'axe-core'
import type { Page } from 'playwright-core'
import { expect } from 'vitest'
import { call, demoEmail, login } from './api'
import { launchBrowser, open } from './browser'
import { readyPair } from './ready-attempt'
import { newTestEvent } from './test-event'

// The accessibility sweep (tests/browser/accessibility-*.test.ts): every page each role can reach from its home,
// each checked in the day theme at a desk's width and in the night theme at a phone's (390 px), by axe-core against WCAG 2.1 A and AA (its colour-contrast rule computes the 4.5:1
// and 3:1 ratios of success criterion 1.4.3). A serious or critical violation fails the test, named with its page;
// so does a page wider than the phone (sideways scrolling; SC 1.4.10, reflow). One crawl per role: each page is
// loaded once and checked in both themes, switched by the page's own theme button. The crawl runs on an event of
// its own (a pair timed, its dossier issued), so what other test files add to the demo never changes it.
/** The browser and the sweep's own event: a pair timed, its dossier issued, its public board open. */
export async function sweepSetup() {
  const ctx = await launchBrowser()
  const event = await newTestEvent('intl-motorcycle', 'Europe/Paris')
  const { attemptId } = await readyPair(event, 'Sweep machine')
  const dossier = await call('POST', `/api/attempts/${attemptId}/dossiers`, { cookie: event.cookie.team })
  expect(dossier.status, JSON.stringify(dossier.body)).toBe(201)
  const board = await call('PATCH', `/api/events/${event.eventId}`, { cookie: event.cookie.organiser, body: { publicBoard: true } })
  expect(board.status, JSON.stringify(board.body)).toBe(200)
  return { ctx, event }
}
type Sweep = Awaited<ReturnType<typeof sweepSetup>>

const WCAG = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa']
type Theme = 'day' | 'dark'
const width = (theme: Theme) => (theme === 'dark' ? 390 : 1280)

/** A page's address with its numbers taken out: one page of each kind is enough. */
const kind = (path: string) => path.replace(/\/\d+/g, '/:id').replace(/[?#].*$/, '')

/** axe-core's own build, put into each page once and run there on the whole document (the pages have no frames). */
const AXE_SOURCE = readFileSync(createRequire(import.meta.url).resolve('axe-core/axe.min.js'), 'utf8')
const AXE_OPTIONS: RunOptions = { runOnly: { type: 'tag', values: WCAG }, resultTypes: ['violations'] }

async function axe(page: Page): Promise<AxeResults> {
  if (!(await page.evaluate(() => 'axe' in window))) await page.evaluate(AXE_SOURCE)
  return page.evaluate(options => (window as unknown as { axe: { run: (c: Document, o: RunOptions) => Promise<AxeResults> } })
    .axe.run(document, options), AXE_OPTIONS)
}

async function violations(page: Page) {
  const result = await axe(page)
  const wide = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth)
  return (wide > 0 ? [`${wide} px wider than the window: it scrolls sideways`] : []).concat(result.violations
    .filter(v => v.impact === 'serious' || v.impact === 'critical')
    .map(v => `${v.id} (${v.impact}): ${v.help} at ${v.nodes.slice(0, 3).map(n => n.target.join(' ')).join(', ')}`
      + ` ${v.nodes[0]?.failureSummary?.replace(/\s+/g, ' ') ?? ''}`))
}

const themeOf = async (page: Page): Promise<Theme> =>
  ((await page.locator('html').getAttribute('class')) ?? '').split(/\s+/).includes('dark') ? 'dark' : 'day'

/** The page as loaded, in its theme at that theme's width, then in the other theme, switched as a person would. */
async function bothThemes(page: Page, path: string, baseUrl: string) {
  const problems: string[] = []
  const first = await themeOf(page)
  const seen: Theme[] = []
  for (const theme of [first, first === 'day' ? 'dark' : 'day'] as const) {
    if (theme !== first) {
      // The page's own theme button where it has one (it keeps the choice in a cookie for the next page).
      const button = page.getByRole('button', { name: first === 'day' ? 'Night' : 'Day', exact: true })
      if (await button.count()) await button.first().click()
      else {
        await page.context().addCookies([{ name: 'trapline-theme', value: theme, url: baseUrl }])
        await page.reload()
        await page.waitForSelector('html[data-hydrated="true"]')
      }
      await expect.poll(() => themeOf(page), { message: `${path}: theme` }).toBe(theme)
      // The pointer off the button, and the colours' transitions over, before the page is judged.
      await page.mouse.move(0, 0)
      await page.waitForFunction(() => document.getAnimations().every(a => a.playState !== 'running'))
    }
    await page.setViewportSize({ width: width(theme), height: 800 })
    seen.push(await themeOf(page))
    problems.push(...(await violations(page)).map(v => `${path} (${theme}): ${v}`))
  }
  expect(seen.sort(), path).toEqual(['dark', 'day'])
  return problems
}

/** Loads each page reachable from `start` by links of this site, two clicks deep, one of each kind; checks each once in both themes. */
async function sweep(page: Page, baseUrl: string, start: string[], follow: boolean, skip: string[] = []) {
  const seen = new Set<string>(skip.map(kind))
  const problems: string[] = []
  let frontier = start
  for (let depth = 0; depth < 3 && frontier.length; depth++) {
    const next: string[] = []
    for (const path of frontier) {
      if (seen.has(kind(path))) continue
      seen.add(kind(path))
      await page.goto(`${baseUrl}${path}`)
      await page.waitForSelector('html[data-hydrated="true"]')
      if (follow && depth < 2) {
        const links = await page.$$eval('a[href^="/"]', as => as.map(a => a.getAttribute('href')!))
        next.push(...links.filter(l => !l.startsWith('/api/') && !/\.(pdf|csv|xlsx|json)$/.test(l) && !l.startsWith('/#')))
      }
      problems.push(...await bothThemes(page, path, baseUrl))
    }
    frontier = next
  }
  return { pages: seen.size - new Set(skip.map(kind)).size, problems }
}

/**
 * The pages anyone sees signed out. A role's crawl leaves them out: signed in, they differ only by the header,
 * which every page of the role's own is checked with.
 */
const publicPaths = (eventId: number) => ['/', '/login', '/forgot', '/calculator', '/record-book', '/verify', '/rules',
  '/cautions', `/board/${eventId}`, '/no-such-page']

/** Every page seen signed out, each in both themes. */
export async function sweepSignedOut({ ctx, event }: Sweep) {
  await ctx.browser.clearCookies()
  const page = await open(ctx.browser, `${ctx.baseUrl}/`)
  const paths = publicPaths(event.eventId)
  const { pages, problems } = await sweep(page, ctx.baseUrl, paths, false)
  await page.close()
  expect(pages).toBe(paths.length)
  expect(problems).toEqual([])
}

/** Every page a role reaches from its home, two clicks deep, each in both themes. */
export async function sweepRole({ ctx, event }: Sweep, role: 'organiser' | 'timekeeper' | 'scrutineer' | 'team' | 'official' | 'admin') {
  // The site administrator is the demo's; every other role is the sweep event's own person.
  const cookie = role === 'admin' ? await login(demoEmail('admin')) : event.cookie[role]
  await ctx.browser.clearCookies()
  const [name, value] = cookie.split(';')[0]!.split('=') as [string, string]
  await ctx.browser.addCookies([{ name, value, url: ctx.baseUrl }, { name: 'trapline-theme', value: 'day', url: ctx.baseUrl }])
  const page = await open(ctx.browser, `${ctx.baseUrl}/home`)
  const { pages, problems } = await sweep(page, ctx.baseUrl, ['/home'], true, publicPaths(event.eventId))
  await page.close()
  expect(pages).toBeGreaterThan(3)
  expect(problems).toEqual([])
}

/** The checker itself: a page given an image without a text alternative and grey text on grey is failed by it. */
export async function checkerFails({ ctx }: Sweep) {
  const page = await open(ctx.browser, `${ctx.baseUrl}/no-such-page`)
  await page.evaluate(() => {
    const main = document.querySelector('main') ?? document.body
    main.insertAdjacentHTML('beforeend', '<img src="/favicon.ico"><p style="color:#777;background:#888">faint</p>')
  })
  const found = await violations(page)
  await page.close()
  // image-alt (WCAG 1.1.1, critical) and color-contrast (1.4.3: #777 on #888 is about 1.3:1, under 4.5:1).
  expect(found.map(v => v.split(' ')[0])).toEqual(expect.arrayContaining(['image-alt', 'color-contrast']))
}
