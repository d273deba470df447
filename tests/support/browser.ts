import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { chromium, type BrowserContext } from 'playwright-core'
import { inject } from 'vitest'

/** Debian's Chromium, headless, with a new empty profile; never a browser download. */
export async function launchBrowser(): Promise<{ browser: BrowserContext; close: () => Promise<void>; baseUrl: string }> {
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
    close: async () => { await context.close(); rmSync(profile, { recursive: true, force: true }) },
  }
}

/** Opens a page and waits until Vue has hydrated it, so typing is not lost to hydration. */
export async function open(context: BrowserContext, url: string) {
  const page = await context.newPage()
  await page.goto(url)
  await page.waitForSelector('html[data-hydrated="true"]')
  return page
}
