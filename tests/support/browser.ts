import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { chromium, type BrowserContext } from 'playwright-core'
import { inject } from 'vitest'
import demo from '../../server/database/demo-people.json'

const demoPassword = demo.password

/** Debian's Chromium, headless, with a new empty profile; never a browser download. */
export async function launchBrowser(): Promise<{ browser: BrowserContext, close: () => Promise<void>, baseUrl: string }> {
  const profile = mkdtempSync(join(tmpdir(), 'trapline-chromium-'))
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    headless: true,
    viewport: { width: 1280, height: 900 },
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  })
  return {
    browser: context,
    baseUrl: inject('baseUrl'),
    close: async () => {
      await context.close()
      rmSync(profile, { recursive: true, force: true })
    },
  }
}

/** Opens a page and waits until Vue has hydrated it, so typing is not lost to hydration. */
export async function open(context: BrowserContext, url: string) {
  const page = await context.newPage()
  await page.goto(url)
  await page.waitForSelector('html[data-hydrated="true"]')
  return page
}

/** Fills and sends the sign-in form in a context with no cookies; returns the page where it lands. */
export async function submitSignIn(ctx: { browser: BrowserContext, baseUrl: string }, email: string, password: string) {
  await ctx.browser.clearCookies()
  const page = await open(ctx.browser, `${ctx.baseUrl}/login`)
  await page.fill('#email', email)
  await page.fill('#password', password)
  await page.click('button[type=submit]')
  return page
}

/** Signs a demo person in (the demo password), waits for the home page, then opens `path` if given. */
export async function signIn(ctx: { browser: BrowserContext, baseUrl: string }, email: string, path?: string) {
  const page = await submitSignIn(ctx, email, demoPassword)
  await page.waitForURL('**/home')
  if (path) {
    await page.goto(`${ctx.baseUrl}${path}`)
    await page.waitForSelector('html[data-hydrated="true"]')
  }
  return page
}

/**
 * Opens `path` as the person whose session cookie is given (a test event's people sign in through the API), in the
 * day or night theme, at a width (390 px: a phone; 1280 px: a laptop).
 */
export async function openAs(
  ctx: { browser: BrowserContext, baseUrl: string },
  cookie: string,
  path: string,
  theme: 'day' | 'dark',
  width: number,
) {
  await ctx.browser.clearCookies()
  await ctx.browser.addCookies([
    ...cookie.split('; ').map((c) => {
      const [name, ...value] = c.split('=')
      return { name: name!, value: value.join('='), url: ctx.baseUrl }
    }),
    { name: 'trapline-theme', value: theme, url: ctx.baseUrl },
  ])
  const page = await open(ctx.browser, `${ctx.baseUrl}${path}`)
  await page.setViewportSize({ width, height: 800 })
  return page
}
