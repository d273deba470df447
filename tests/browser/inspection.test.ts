import { afterAll, beforeAll, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import demo from '../../server/database/demo-people.json'
import { call, demoEventId, demoEventPath, invitedPerson, login, useTestServer } from '../support/api'
import { answerAll, FIGURES, newEntry } from '../support/entries'
import { launchBrowser, signIn } from '../support/browser'

await useTestServer()
let ctx: Awaited<ReturnType<typeof launchBrowser>>
beforeAll(async () => {
  ctx = await launchBrowser()
})
afterAll(async () => {
  await ctx?.close()
})

it('the scrutineer completes and signs an inspection, and the team sees its entry cleared', async () => {
  // A new entry of the second demo team, through the API, so that this test owns it.
  const team2 = await login('team2@trapline.test')
  const setup = (await call('GET', `/api${await demoEventPath('/setup')}`, { cookie: team2 })).body
  const entry = await call('POST', `/api${await demoEventPath('/entries')}`, {
    cookie: team2,
    body: { machine: { name: 'Cinder Tallow', power: 'electric', declaredMassKg: '150.0', division: 'none' }, rider: { name: 'Jory Vantreese', licenceNo: 'DEMO-L-0990', licenceExpires: '2099-08-12' }, className: 'Electric, unstreamlined', distanceId: setup.distances[1].id },
  })
  expect(entry.status).toBe(201)

  const page = await signIn(ctx, 'scrutineer@trapline.test', await demoEventPath('/inspections'))
  await page.locator(`[data-test="entry-${entry.body.id}"] button:has-text("Inspect")`).click()
  await page.waitForURL('**/inspections/*')
  await page.waitForSelector('html[data-hydrated="true"]')
  await page.fill('#bus-v', '96')
  await page.fill('#declared', '124')
  await page.selectOption('#declared-unit', 'mph')
  // The class goes by the streamlining division: the scrutineer confirms what the team declared.
  expect(await page.locator('label[for="division-seen"]').innerText()).toContain('declared: unstreamlined')
  await page.selectOption('#division-seen', 'none')
  await saveFigures(page)
  // Declared 124 mph = 199.558656 km/h exactly (1 mile = 1.609344 km, NIST SP 811): no parachute needed
  // under 175 mph (club rules, from memory); tyres rated 240 km/h (speed symbol V, from memory).
  const measured: Record<string, [string, string]> = {
    'isolation': ['20', 'kΩ'], 'bonding': ['0.04', 'Ω'], 'mass': ['151.2', 'kg'], 'parachute': ['0', 'count'],
    'tyres-rated': ['240', 'km/h'],
  }
  const rows = page.locator('[data-test^="item-"]')
  for (let i = 0; i < await rows.count(); i++) {
    const row = rows.nth(i)
    const key = (await row.getAttribute('data-test'))!.slice(5)
    if (measured[key]) {
      await row.locator('input[inputmode="decimal"]').fill(measured[key]![0])
      await row.locator('select').selectOption(measured[key]![1])
    }
    const choice = key === 'canopy-exit' ? 'Not applicable' : 'Pass'
    // Not applicable with the reason written (the scrutineer says why it does not apply).
    if (choice === 'Not applicable') await row.getByLabel(/^Note for /).fill('no canopy: the rider sits in the open')
    await row.getByRole('button', { name: choice }).click()
    await expect.poll(() => row.getByRole('button', { name: choice }).getAttribute('aria-pressed')).toBe('true')
  }
  // UN ECE Regulation 100, 5.1.3: 20 kΩ on a 96 V DC bus is 208.3 Ω/V, over the 100 Ω/V needed.
  expect(await page.locator('[data-test="item-isolation"] [data-test="verdict"]').innerText()).toContain('208.3 Ω/V at 96 V DC, at least 100 Ω/V needed')
  expect(await page.getByRole('note').innerText()).toContain('the chief scrutineer and qualified high-voltage practice decide')

  await page.fill('#si-name', 'Selma Scrute')
  await page.fill('#si-pass', demo.password)
  const pad = page.getByLabel('Draw your signature')
  const box = (await pad.boundingBox())!
  await page.mouse.move(box.x + 20, box.y + 40)
  await page.mouse.down()
  await page.mouse.move(box.x + 120, box.y + 80, { steps: 5 })
  await page.mouse.up()
  await signInspection(page)
  await expect.poll(() => page.locator('[data-test="clearance"]').innerText()).toContain('Cleared to run')

  const team = await signIn(ctx, 'team2@trapline.test', await demoEventPath('/entries'))
  const card = team.locator('article', { hasText: 'Cinder Tallow' })
  await expect.poll(() => card.locator('[data-test="entry-clearance"]').innerText()).toContain('Cleared to run')
})

it('an official ticks the runs seen, writes apart, reads the statement back, signs it, and finds it listed', async () => {
  // An official of this test's own: each demo official already has a statement on the demo pair.
  const official = await invitedPerson('official', demo.password, 'Ottilie Oxley')
  const page = await signIn(ctx, official.email, await demoEventPath('/statements'))
  // Words first, then ticks: a tick never writes over what was typed (and typing is never moved by a tick).
  await page.fill('#st-runs', 'the return from the tower')
  const ticks = page.locator('[data-test="runs-seen-ticks"] input[type="checkbox"]')
  const runCount = await ticks.count()
  for (let i = 0; i < runCount; i++) await ticks.nth(i).check()
  expect(await page.locator('#st-runs').inputValue()).toBe('the return from the tower')
  await page.fill('#st-position', 'at the exit trap of the mile')
  await page.fill('#st-conditions', 'dry, light southerly wind')
  await page.fill('#st-name', 'Ottilie Oxley')
  await page.fill('#st-pass', demo.password)
  // Enter in the password field asks; it does not sign.
  await page.press('#st-pass', 'Enter')
  const readBack = page.locator('[data-test="read-back-text"]')
  await readBack.waitFor()
  expect(await readBack.innerText()).toMatch(/^Sign this statement on attempt #\d+ .* as Ottilie Oxley\? Runs seen: run #\d+ \(\w+.*\); in your words “the return from the tower”\. Watched from: at the exit trap of the mile\. Conditions: dry, light southerly wind\. Irregularities: none\.$/)
  expect(await page.locator('article', { hasText: 'at the exit trap of the mile' }).count()).toBe(0)
  await page.click('[data-test="read-back-yes"]')
  const article = page.locator('article', { hasText: 'at the exit trap of the mile' })
  await article.waitFor()
  expect(await article.innerText()).toContain('Signed by Ottilie Oxley')
  expect(await article.innerText()).toContain('· the return from the tower')
  await article.getByRole('link', { name: 'check the signature' }).click()
  await page.waitForURL('**/signatures/*')
  await expect.poll(() => page.locator('[data-test="stored-matches"]').innerText()).toContain('still matches its hash')
})

it('a measured value under its limit fails, whatever is ticked, and the machine is not cleared', async () => {
  const entryId = await newEntry(await demoEventId(await login('team2@trapline.test')), 'Cinder Leak')
  const page = await signIn(ctx, 'scrutineer@trapline.test', await demoEventPath('/inspections'))
  await page.locator(`[data-test="entry-${entryId}"] button:has-text("Inspect")`).click()
  await page.waitForURL('**/inspections/*')
  await page.waitForSelector('html[data-hydrated="true"]')
  expect(await page.locator('[data-test="hv-note"]').innerText()).toContain('qualified person with the machine made safe')
  await page.fill('#bus-v', '400')
  await page.fill('#declared', '290')
  await saveFigures(page)
  // UN ECE Regulation 100, 5.1.3: 20 kΩ on a 400 V DC bus is 50 Ω/V, under the 100 Ω/V needed.
  const measured: Record<string, [string, string]> = {
    'isolation': ['20', 'kΩ'], 'bonding': ['0.04', 'Ω'], 'mass': ['181.5', 'kg'], 'canopy-exit': ['12', 's'],
    'parachute': ['1', 'count'], 'tyres-rated': ['300', 'km/h'],
  }
  const rows = page.locator('[data-test^="item-"]')
  for (let i = 0; i < await rows.count(); i++) {
    const row = rows.nth(i)
    const key = (await row.getAttribute('data-test'))!.slice(5)
    if (measured[key]) {
      await row.locator('input[inputmode="decimal"]').fill(measured[key]![0])
      await row.locator('select').selectOption(measured[key]![1])
    }
    await row.getByRole('button', { name: 'Pass' }).click()
    await expect.poll(() => row.getByRole('button', { name: 'Pass' }).getAttribute('aria-pressed')).toBe('true')
  }
  await expect.poll(() => page.locator('[data-test="item-isolation"] [data-test="verdict"]').innerText())
    .toContain('50.0 Ω/V at 400 V DC is under the 100 Ω/V needed')
  await page.fill('#si-name', 'Selma Scrute')
  await page.fill('#si-pass', demo.password)
  await signInspection(page)
  // Not signed until the scrutineer says which division is seen: the class goes by it.
  await expect.poll(() => page.locator('[data-test="sign-division"]').innerText())
    .toContain('confirm the streamlining division you see: the class (Electric, partially streamlined) goes by it')
  await page.selectOption('#division-seen', 'partial')
  await saveFigures(page)
  await page.fill('#si-pass', demo.password)
  await signInspection(page)
  // Signed, and still not cleared: the measured value decided.
  await expect.poll(() => page.locator('[data-test="clearance"]').innerText()).toContain('under the 100 Ω/V needed')
  expect(await page.locator('[data-test="clearance"]').innerText()).toContain('Not cleared: failed')
})

it('a safety item is left out only with its article, and the copy waits for a scrutineer to sign it', async () => {
  const organiser = await signIn(ctx, 'organiser@trapline.test', await demoEventPath('/inspections'))
  await organiser.selectOption('#ad-base', 'electric-streamliner')
  await organiser.locator('label', { hasText: 'Parachutes fitted and packed' }).locator('input').check()
  // Common practice: the parachute is a safety item; the (invented) local rulebook allows leaving it out.
  await organiser.fill('#ad-ref-parachute', 'local rulebook, article 7.2 (under 175 mph)')
  await organiser.fill('#ad-note', 'local rulebook 2026')
  await organiser.click('button:has-text("Save the adapted checklist")')
  const card = organiser.locator('[data-test^="checklist-"]', { hasText: 'article 7.2 (under 175 mph)' })
  await expect.poll(() => card.innerText()).toContain('Waiting for the chief scrutineer\'s signature')

  const scrutineer = await signIn(ctx, 'scrutineer@trapline.test', await demoEventPath('/inspections'))
  const pending = scrutineer.locator('[data-test^="checklist-"]', { hasText: 'article 7.2 (under 175 mph)' })
  await pending.locator('input[id^="cl-name-"]').fill('Selma Scrute')
  await pending.locator('input[id^="cl-pass-"]').fill(demo.password)
  await pending.getByRole('button', { name: 'Sign the adapted checklist' }).click()
  await expect.poll(() => pending.innerText()).toContain('Signed by a scrutineer')
})

it('a scrutineer adds a passkey on the account page and signs an inspection with it', async () => {
  // A scrutineer of this test's own: a passkey on a demo account would change what other tests expect.
  const scrutineer = await invitedPerson('scrutineer', demo.password, 'Pella Keyward')
  const page = await signIn(ctx, scrutineer.email, '/account')
  // Chromium's virtual authenticator through the DevTools protocol (a platform passkey that verifies the user).
  const cdp = await ctx.browser.newCDPSession(page)
  await cdp.send('WebAuthn.enable')
  await cdp.send('WebAuthn.addVirtualAuthenticator', {
    options: { protocol: 'ctap2', transport: 'internal', hasResidentKey: true, hasUserVerification: true, isUserVerified: true },
  })
  await page.fill('#pk-name', 'test laptop')
  await page.fill('#pk-password', demo.password)
  await page.click('button:has-text("Add a passkey")')
  await expect.poll(() => page.locator('[data-test="passkeys"]').innerText()).toContain('test laptop')

  const eventId = await demoEventId(scrutineer.cookie)
  const entryId = await newEntry(eventId, 'Cinder Keyed')
  const started = await call('POST', `/api/events/${eventId}/inspections`, { cookie: scrutineer.cookie, body: { entryId, baseId: 'electric-motorcycle' } })
  await call('PATCH', `/api/inspections/${started.body.id}`, { cookie: scrutineer.cookie, body: FIGURES })
  await answerAll(started.body.id, undefined, { scrutineer: scrutineer.cookie })
  await page.goto(`${ctx.baseUrl}/inspections/${started.body.id}`)
  await page.waitForSelector('html[data-hydrated="true"]')
  await page.fill('#si-name', 'Pella Keyward')
  await page.click('button:has-text("Sign with a passkey")')
  await page.click('[data-test="read-back-yes"]')
  await expect.poll(() => page.locator('[data-test="clearance"]').innerText()).toContain('Cleared to run')
  const view = (await call('GET', `/api/inspections/${started.body.id}`, { cookie: scrutineer.cookie })).body
  const report = (await call('GET', `/api/signatures/${view.signature.id}`, { cookie: scrutineer.cookie })).body
  expect(report).toMatchObject({ method: 'passkey', passkeyHolds: true, recordStillMatches: true })

  // Revoked on the account page (a lost laptop): it signs nothing more, and what it signed still holds.
  await page.goto(`${ctx.baseUrl}/account`)
  await page.waitForSelector('html[data-hydrated="true"]')
  const key = page.locator('[data-test="passkeys"] li', { hasText: 'test laptop' })
  await key.getByRole('button', { name: 'Revoke…' }).click()
  await key.getByLabel('Why').fill('laptop lost')
  await key.getByLabel('Your password').fill(demo.password)
  await key.getByRole('button', { name: 'Revoke it' }).click()
  await expect.poll(() => key.innerText()).toContain('revoked')
  const again = (await call('GET', `/api/signatures/${view.signature.id}`, { cookie: scrutineer.cookie })).body
  expect(again).toMatchObject({ passkeyHolds: true })
})

it('the capacity calculator fills the engine capacity from bore, stroke and cylinders', async () => {
  const team2 = await login('team2@trapline.test')
  const eventId = await demoEventId(team2)
  const setup = (await call('GET', `/api/events/${eventId}/setup`, { cookie: team2 })).body
  const entry = await call('POST', `/api/events/${eventId}/entries`, {
    cookie: team2,
    body: { machine: { name: 'Cinder Piston', power: 'combustion', declaredMassKg: '160.0', division: 'none' }, rider: { name: 'Jory Vantreese', licenceNo: 'DEMO-L-0991', licenceExpires: '2099-08-12' }, className: 'Combustion, over 750 cm³ up to 1000 cm³, unstreamlined', distanceId: setup.distances[0].id },
  })
  expect(entry.status, JSON.stringify(entry.body)).toBe(201)
  const scrutineer = await login('scrutineer@trapline.test')
  const started = await call('POST', `/api/events/${eventId}/inspections`, { cookie: scrutineer, body: { entryId: entry.body.id, baseId: 'combustion-motorcycle' } })
  const page = await signIn(ctx, 'scrutineer@trapline.test', `/inspections/${started.body.id}`)
  const row = page.locator('[data-test="item-engine-capacity"]')
  // π/4 · 100² · 100 mm³ = 785.398… cm³ (the swept-volume formula), rounded to two decimals.
  await row.locator('input[id="bore-engine-capacity"]').fill('100')
  await row.locator('input[id="stroke-engine-capacity"]').fill('100')
  await row.locator('input[id="cyl-engine-capacity"]').fill('1')
  await row.getByRole('button', { name: 'Compute the capacity' }).click()
  expect(await row.locator('input#v-engine-capacity').inputValue()).toBe('785.40')
  await row.getByRole('button', { name: 'Pass' }).click()
  await expect.poll(() => row.locator('[data-test="verdict"]').innerText()).toContain('785.4 cm³ recorded')
})

/** Presses "Sign the inspection", reads back what the signature covers, and signs. */
async function signInspection(page: Page) {
  await page.click('button:has-text("Sign the inspection")')
  expect(await page.locator('[data-test="read-back-text"]').innerText()).toMatch(/^Sign inspection #\d+ \(Electric motorcycle\) as .+\? \d+ of \d+ items answered: \d+ passed, \d+ failed, \d+ not applicable/)
  await page.click('[data-test="read-back-yes"]')
}

/** Saves the inspection's figures and waits for the server to take them. */
async function saveFigures(page: Page) {
  const saved = page.waitForResponse(r => r.request().method() === 'PATCH' && r.url().includes('/api/inspections/'))
  await page.click('button:has-text("Save the figures")')
  expect((await saved).status()).toBe(200)
}
