import type { BrowserContext } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import demo from '../../server/database/demo-people.json'
import { launchBrowser, submitSignIn } from '../support/browser'

let ctx: Awaited<ReturnType<typeof launchBrowser>>
beforeAll(async () => {
  ctx = await launchBrowser()
})
afterAll(async () => {
  await ctx?.close()
})

describe('signing in as each demo role', () => {
  for (const person of demo.people) {
    const role = person.admin ? 'admin' : person.role!
    it(`${person.email} lands on the ${role} home`, async () => {
      const page = await submitSignIn(ctx, person.email, demo.password)
      await page.waitForURL('**/home')
      const card = page.locator(`[data-test="home-${role}"]`)
      await card.waitFor()
      if (role !== 'admin') {
        expect(await card.locator('h2').innerText()).toContain({ organiser: 'Organiser', timekeeper: 'Timekeeper', scrutineer: 'Scrutineer', team: 'Team', official: 'Official' }[role])
        if (person.team) expect(await card.innerText()).toContain(person.team)
      }
      expect(await page.locator('[data-test="account-link"]').innerText()).toBe(person.name)
      await page.close()
    })
  }

  it('shows the error for a wrong password and stays on the sign-in page', async () => {
    const page = await submitSignIn(ctx, demo.people[1]!.email, 'not-the-password')
    const error = page.locator('[data-test="login-error"]')
    await error.waitFor()
    expect(await error.innerText()).toContain('Wrong e-mail address or password')
    expect(new URL(page.url()).pathname).toBe('/login')
    await page.close()
  })

  it('sends a signed-out visitor from a home page to the sign-in page', async () => {
    const context = ctx.browser as BrowserContext
    await context.clearCookies()
    const page = await context.newPage()
    await page.goto(`${ctx.baseUrl}/home`)
    await page.waitForURL('**/login?next=/home')
    expect(new URL(page.url()).searchParams.get('next')).toBe('/home')
    await page.close()
  })
})
