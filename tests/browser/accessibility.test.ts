import AxeBuilder from '@axe-core/playwright'
import type { BrowserContext, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { demoEmail } from '../support/api'
import { launchBrowser, open, signIn } from '../support/browser'

// Every page each role can reach from its home, in the day theme at a desk's width and in the night theme at
// a phone's (390 px), checked by axe-core against WCAG 2.1 A and AA (its colour-contrast rule computes the
// 4.5:1 and 3:1 ratios of success criterion 1.4.3). A serious or critical violation fails the test, named
// with its page; so does a page wider than the phone (sideways scrolling; SC 1.4.10, reflow).
let ctx: Awaited<ReturnType<typeof launchBrowser>>
beforeAll(async () => {
  ctx = await launchBrowser()
})
afterAll(async () => {
  await ctx?.close()
})

const WCAG = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa']

/** A page's address with its numbers taken out: one page of each kind is enough. */
const kind = (path: string) => path.replace(/\/\d+/g, '/:id').replace(/[?#].*$/, '')

async function setTheme(browser: BrowserContext, baseUrl: string, theme: 'day' | 'dark') {
  await browser.addCookies([{ name: 'trapline-theme', value: theme, url: baseUrl }])
}

async function violations(page: Page) {
  const result = await new AxeBuilder({ page }).withTags(WCAG).analyze()
  const wide = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth)
  return (wide > 0 ? [`${wide} px wider than the window: it scrolls sideways`] : []).concat(result.violations
    .filter(v => v.impact === 'serious' || v.impact === 'critical')
    .map(v => `${v.id} (${v.impact}): ${v.help} at ${v.nodes.slice(0, 3).map(n => n.target.join(' ')).join(', ')}`
      + ` ${v.nodes[0]?.failureSummary?.replace(/\s+/g, ' ') ?? ''}`))
}
const width = (theme: 'day' | 'dark') => (theme === 'dark' ? 390 : 1280)

/** The pages reachable from `start` by links of this site, two clicks deep, one of each kind. */
async function reachable(page: Page, baseUrl: string, start: string[]) {
  const seen = new Map<string, string>()
  let frontier = start
  for (let depth = 0; depth < 3 && frontier.length; depth++) {
    const next: string[] = []
    for (const path of frontier) {
      if (seen.has(kind(path))) continue
      seen.set(kind(path), path)
      if (depth === 2) continue
      await page.goto(`${baseUrl}${path}`)
      await page.waitForSelector('html[data-hydrated="true"]')
      const links = await page.$$eval('a[href^="/"]', as => as.map(a => a.getAttribute('href')!))
      next.push(...links.filter(l => !l.startsWith('/api/') && !/\.(pdf|csv|xlsx|json)$/.test(l) && !l.startsWith('/#')))
    }
    frontier = next
  }
  return [...seen.values()]
}

const roles = ['organiser', 'timekeeper', 'scrutineer', 'team', 'official', 'admin'] as const

describe.each(['day', 'dark'] as const)('the %s theme', (theme) => {
  it('pages seen signed out have no serious or critical accessibility violation', async () => {
    await ctx.browser.clearCookies()
    await setTheme(ctx.browser, ctx.baseUrl, theme)
    const page = await open(ctx.browser, `${ctx.baseUrl}/`)
    await page.setViewportSize({ width: width(theme), height: 800 })
    const problems: string[] = []
    for (const path of ['/', '/login', '/forgot', '/calculator', '/record-book', '/verify', '/rules', '/cautions', '/board/1', '/no-such-page']) {
      await page.goto(`${ctx.baseUrl}${path}`)
      await page.waitForSelector('html[data-hydrated="true"]')
      problems.push(...(await violations(page)).map(v => `${path}: ${v}`))
    }
    await page.close()
    expect(problems).toEqual([])
  })

  it.each(roles)('every page the %s reaches has no serious or critical accessibility violation', async (role) => {
    await setTheme(ctx.browser, ctx.baseUrl, theme)
    const page = await signIn(ctx, demoEmail(role))
    await page.setViewportSize({ width: width(theme), height: 800 })
    await setTheme(ctx.browser, ctx.baseUrl, theme)
    const pages = await reachable(page, ctx.baseUrl, ['/home'])
    expect(pages.length).toBeGreaterThan(3)
    const problems: string[] = []
    for (const path of pages) {
      await page.goto(`${ctx.baseUrl}${path}`)
      await page.waitForSelector('html[data-hydrated="true"]')
      expect(await page.locator('html').getAttribute('class') ?? '').toContain(theme === 'dark' ? 'dark' : '')
      problems.push(...(await violations(page)).map(v => `${path}: ${v}`))
    }
    await page.close()
    expect(problems).toEqual([])
  }, 180_000)
})
