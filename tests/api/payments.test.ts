import Stripe from 'stripe'
import { beforeAll, describe, expect, inject, it } from 'vitest'
import { call, mailTo, useTestServer, url } from '../support/api'
import { clearedEntry } from '../support/entries'
import { pdfText } from '../support/pdf-tools'
import { newTestEvent, type TestEvent } from '../support/test-event'

await useTestServer()

// Fees paid through the payment provider's official SDK against its local fake (scripts/payments-fake.mjs): the
// hosted page pays, fails or cancels; only the provider's signed webhook confirms. Amounts are integer cents.
let event: TestEvent
let teamEmail: string
const fake = () => inject('paymentsUrl')
const signer = new Stripe('sk_test_fake')
const SECRET = 'whsec_trapline_test_secret' // tests/support/global-setup.ts

beforeAll(async () => {
  event = await newTestEvent('intl-motorcycle', 'UTC')
  teamEmail = (await call('GET', '/api/me', { cookie: event.cookie.team })).body.user.email
})

const entry = (name: string) => clearedEntry(event.eventId, name, {}, {
  team: event.cookie.team, scrutineer: event.cookie.scrutineer, scrutineerPassword: 'first-password-1',
})
const fees = async () => (await call('GET', `/api/events/${event.eventId}/fees`, { cookie: event.cookie.team })).body
const stateOf = async (entryId: number) => (await fees()).entries.find((e: { entryId: number }) => e.entryId === entryId)
/** The team opens the checkout and presses a button on the provider's hosted page. */
async function checkout(entryId: number, press: 'pay' | 'fail' | 'cancel') {
  const r = await call('POST', `/api/entries/${entryId}/checkout`, { cookie: event.cookie.team, body: { fee: 'entry' } })
  expect(r.status, JSON.stringify(r.body)).toBe(201)
  expect(r.body.url).toMatch(new RegExp(`^${fake()}/checkout/cs_test_`))
  const page = await (await fetch(r.body.url)).text()
  expect(page).toContain('150.00 EUR')
  const back = await fetch(`${r.body.url}/${press}`, { method: 'POST', redirect: 'manual' })
  expect(back.status).toBe(303)
  return back.headers.get('location')!
}

describe('fees', () => {
  it('are set as whole cents with their currency; a fraction of a cent is refused, naming the field', async () => {
    const put = (body: object) => call('PUT', `/api/events/${event.eventId}/fees`, { cookie: event.cookie.organiser, body })
    const bad = await put({ currency: 'eur', entryMinor: 15000.5 })
    expect(bad.status).toBe(422)
    expect(bad.body.data.issues[0]).toEqual({ path: 'entryMinor', message: 'must be a whole number of cents' })
    expect((await put({ currency: 'eur', entryMinor: 15000, lateMinor: 20000 })).body.data.issues[0].path).toBe('lateAfter')
    const ok = await put({ currency: 'eur', entryMinor: 15000, recordMinor: 2500, requirePayment: true })
    expect(ok.status, JSON.stringify(ok.body)).toBe(200)
    expect(ok.body).toMatchObject({ currency: 'eur', entryMinor: 15000, recordMinor: 2500, requirePayment: true })
    const asTeam = await call('PUT', `/api/events/${event.eventId}/fees`, { cookie: event.cookie.team, body: { currency: 'eur', entryMinor: 1 } })
    expect(asTeam.status).toBe(403)
  })

  it('a paid entry fee is confirmed only by the webhook; the team gets a receipt; the entry may then run', async () => {
    const id = await entry('Paying Sprite')
    const start = () => call('POST', `/api/events/${event.eventId}/runs`, { cookie: event.cookie.timekeeper, body: { entryId: id, direction: 'out' } })
    const refused = await start()
    expect(refused.status).toBe(409)
    expect(refused.body.message).toContain('fee is not paid')
    expect((await stateOf(id)).entry).toMatchObject({ fee: 'entry', amountMinor: 15000, state: 'unpaid' })
    const location = await checkout(id, 'pay')
    expect(location).toContain(`/events/${event.eventId}/entries?paid=${id}`)
    await expect.poll(async () => (await stateOf(id)).entry.state).toBe('paid')
    const mail = await mailTo(teamEmail, 'Receipt R-')
    expect(mail.text).toContain('150.00 EUR')
    const payment = (await stateOf(id)).payments[0]
    const pdf = await fetch(url(`/api/payments/${payment.id}/receipt.pdf`), { headers: { cookie: event.cookie.team } })
    expect(pdf.status).toBe(200)
    const text = await pdfText(new Uint8Array(await pdf.arrayBuffer()), 'receipt.pdf')
    expect(text).toContain(payment.receiptNo)
    expect(text).toContain('150.00 EUR')
    expect((await start()).status).toBe(201)
    // Paid once: a second checkout of the same fee is refused.
    expect((await call('POST', `/api/entries/${id}/checkout`, { cookie: event.cookie.team, body: { fee: 'entry' } })).status).toBe(409)
  })

  it('a cancelled or failed payment never loses the entry, and shows as such', async () => {
    const cancelled = await entry('Cancelling Sprite')
    expect(await checkout(cancelled, 'cancel')).toContain(`cancelled=${cancelled}`)
    await expect.poll(async () => (await stateOf(cancelled)).entry.state).toBe('cancelled')
    const failed = await entry('Declined Sprite')
    await checkout(failed, 'fail')
    await expect.poll(async () => (await stateOf(failed)).entry.state).toBe('failed')
    const sheet = (await call('GET', `/api/events/${event.eventId}/run-sheet`, { cookie: event.cookie.timekeeper })).body
    expect(sheet.entries.map((e: { id: number }) => e.id)).toEqual(expect.arrayContaining([cancelled, failed]))
    // A later attempt pays.
    await checkout(failed, 'pay')
    await expect.poll(async () => (await stateOf(failed)).entry.state).toBe('paid')
  })

  it('the organiser refunds part, then the rest, with reasons; each confirmed by the webhook', async () => {
    const list = (await call('GET', `/api/events/${event.eventId}/payments`, { cookie: event.cookie.organiser })).body
    const paid = list.payments.find((p: { machine: string, status: string }) => p.machine === 'Paying Sprite' && p.status === 'paid')
    const refund = (body: object) => call('POST', `/api/payments/${paid.id}/refunds`, { cookie: event.cookie.organiser, body })
    expect((await refund({ amountMinor: 50_000, reason: 'too much' })).body.data.issues[0].path).toBe('amountMinor')
    expect((await refund({ amountMinor: 5000 })).body.data.issues[0].path).toBe('reason')
    expect((await refund({ amountMinor: 5000, reason: 'entry withdrawn after inspection' })).status).toBe(201)
    const refunded = async () => (await call('GET', `/api/events/${event.eventId}/payments`, { cookie: event.cookie.organiser })).body
      .payments.find((p: { id: number }) => p.id === paid.id).refundedMinor
    await expect.poll(refunded).toBe(5000)
    expect((await refund({ reason: 'event cancelled' })).status).toBe(201)
    await expect.poll(refunded).toBe(15000)
    expect((await refund({ reason: 'again' })).status).toBe(422)
    const totals = (await call('GET', `/api/events/${event.eventId}/payments`, { cookie: event.cookie.organiser })).body.totals
    expect(totals.entry).toEqual({ paidMinor: 30000, refundedMinor: 15000, count: 2 })
    const csv = await (await fetch(url(`/api/events/${event.eventId}/payments.csv`), { headers: { cookie: event.cookie.organiser } })).text()
    expect(csv.split('\n')[0]).toContain('Receipt,Paid at (UTC),Team,Machine')
    expect(csv).toMatch(/Paying Sprite,\d+,Entry fee,EUR,150\.00,150\.00,0\.00,paid/)
  })

  it('three whole refunds sent at once refund the payment once: the others are refused', async () => {
    const list = (await call('GET', `/api/events/${event.eventId}/payments`, { cookie: event.cookie.organiser })).body
    const other = list.payments.find((p: { status: string, refundedMinor: number }) => p.status === 'paid' && p.refundedMinor === 0)
    const answers = await Promise.all([1, 2, 3].map(i => call('POST', `/api/payments/${other.id}/refunds`, {
      cookie: event.cookie.organiser, body: { reason: `cancelled, request ${i}` },
    })))
    expect(answers.map(a => a.status).sort()).toEqual([201, 422, 422])
    for (const refused of answers.filter(a => a.status === 422)) expect(refused.body.data.issues[0].path).toBe('amountMinor')
    const refunded = async () => (await call('GET', `/api/events/${event.eventId}/payments`, { cookie: event.cookie.organiser })).body
      .payments.find((p: { id: number }) => p.id === other.id).refundedMinor
    await expect.poll(refunded).toBe(other.amountMinor)
  })
})

describe('the webhook', () => {
  const post = (payload: string, signature: string) => fetch(url('/api/payments/webhook'), {
    method: 'POST', headers: { 'content-type': 'application/json', 'stripe-signature': signature }, body: payload,
  })
  const payload = JSON.stringify({ id: 'evt_test_replay_1', object: 'event', type: 'checkout.session.expired', data: { object: { id: 'cs_none' } } })

  it('refuses a wrong signature, and a replayed one older than the tolerance', async () => {
    expect((await post(payload, signer.webhooks.generateTestHeaderString({ payload, secret: 'whsec_wrong' }))).status).toBe(400)
    // The SDK's default tolerance is 300 s: a signature made an hour ago is a replay.
    const old = signer.webhooks.generateTestHeaderString({ payload, secret: SECRET, timestamp: Math.floor(Date.now() / 1000) - 3600 })
    expect((await post(payload, old)).status).toBe(400)
  })

  it('takes an event once, by its id', async () => {
    const fresh = () => signer.webhooks.generateTestHeaderString({ payload, secret: SECRET })
    expect(await (await post(payload, fresh())).json()).toEqual({ taken: true, duplicate: false })
    expect(await (await post(payload, fresh())).json()).toEqual({ taken: false, duplicate: true })
  })
})
