// A local fake of the few calls of the payment provider's API that Trapline makes, for the demo and the
// tests, never a real account: checkout sessions (with a hosted page that pays, fails or cancels), refunds,
// and signed webhooks, signed with the provider SDK's own test helper so the app checks them as it would
// real ones.
//   node scripts/payments-fake.mjs --port 12111 --secret whsec_… [--webhook http://127.0.0.1:3000/api/payments/webhook]
// POST /_fake/config {"webhook": url} sets the webhook address later (the app's port may be chosen after).
import { randomBytes } from 'node:crypto'
import { createServer } from 'node:http'
import { parseArgs } from 'node:util'
import Stripe from 'stripe'

const { values } = parseArgs({ options: {
  port: { type: 'string', default: '12111' },
  secret: { type: 'string', default: 'whsec_trapline_demo' },
  webhook: { type: 'string', default: '' },
} })
const stripe = new Stripe('sk_test_fake')
let webhook = values.webhook
const sessions = new Map()
const refunds = new Map()
const id = prefix => `${prefix}_test_${randomBytes(12).toString('hex')}`
const now = () => Math.floor(Date.now() / 1000)

/** The provider's form encoding (a[b][0][c]=x) back into an object. */
function decodeForm(text) {
  const out = {}
  for (const [k, v] of new URLSearchParams(text)) {
    const path = k.replace(/\]/g, '').split('[')
    let o = out
    path.forEach((p, i) => {
      if (i === path.length - 1) o[p] = v
      else o = (o[p] ??= /^\d+$/.test(path[i + 1]) ? [] : {})
    })
  }
  return out
}

async function send(type, object) {
  if (!webhook) return
  const payload = JSON.stringify({ id: id('evt'), object: 'event', type, created: now(), data: { object }, livemode: false, api_version: '2025-01-01' })
  const header = stripe.webhooks.generateTestHeaderString({ payload, secret: values.secret })
  await fetch(webhook, { method: 'POST', headers: { 'content-type': 'application/json', 'stripe-signature': header }, body: payload })
    .catch(e => console.error(`[payments-fake] webhook to ${webhook} failed: ${e.message}`))
}

const json = (res, status, body) => {
  res.writeHead(status, { 'content-type': 'application/json' })
  res.end(JSON.stringify(body))
}
const notFound = (res, what) => json(res, 404, { error: { type: 'invalid_request_error', message: `No such ${what}` } })

function page(s) {
  const money = `${(s.amount_total / 100).toFixed(2)} ${s.currency.toUpperCase()}`
  return `<!doctype html><html lang="en"><meta charset="utf-8"><meta name="viewport" content="width=device-width">
<title>Test checkout</title><body style="font:18px system-ui;max-width:32rem;margin:3rem auto;padding:0 1rem">
<p><strong>Test payment page</strong> (a local fake of the payment provider: no money moves).</p>
<h1 style="font-size:1.4rem">${s.line_items_description}</h1><p>Amount: <strong data-test="amount">${money}</strong></p>
<form method="post" action="/checkout/${s.id}/pay"><button data-test="pay" style="font-size:1.1rem;padding:.6rem 1.2rem">Pay ${money}</button></form>
<form method="post" action="/checkout/${s.id}/fail" style="margin-top:1rem"><button data-test="fail">Card declined</button></form>
<form method="post" action="/checkout/${s.id}/cancel" style="margin-top:1rem"><button data-test="cancel">Cancel and go back</button></form>
</body></html>`
}

const server = createServer(async (req, res) => {
  let body = ''
  for await (const c of req) body += c
  const url = new URL(req.url, 'http://x')
  const m = re => re.exec(url.pathname)
  let hit
  if (url.pathname === '/_fake/ready') return json(res, 200, { ok: true, webhook })
  if (req.method === 'POST' && url.pathname === '/_fake/config') {
    webhook = JSON.parse(body).webhook
    return json(res, 200, { webhook })
  }
  if (req.method === 'POST' && url.pathname === '/v1/checkout/sessions') {
    const f = decodeForm(body)
    const item = f.line_items?.[0] ?? {}
    const s = {
      id: id('cs'), object: 'checkout.session', mode: 'payment', status: 'open', payment_status: 'unpaid',
      amount_total: Number(item.price_data?.unit_amount ?? 0) * Number(item.quantity ?? 1),
      currency: item.price_data?.currency ?? 'eur', metadata: f.metadata ?? {}, client_reference_id: f.client_reference_id ?? null,
      customer_email: f.customer_email ?? null, success_url: f.success_url, cancel_url: f.cancel_url, payment_intent: null,
      line_items_description: item.price_data?.product_data?.name ?? 'Payment',
    }
    s.url = `http://127.0.0.1:${values.port}/checkout/${s.id}`
    sessions.set(s.id, s)
    return json(res, 200, s)
  }
  if (req.method === 'GET' && (hit = m(/^\/v1\/checkout\/sessions\/([\w]+)$/))) {
    const s = sessions.get(hit[1])
    return s ? json(res, 200, s) : notFound(res, 'checkout session')
  }
  if (req.method === 'POST' && url.pathname === '/v1/refunds') {
    const f = decodeForm(body)
    const s = [...sessions.values()].find(x => x.payment_intent === f.payment_intent)
    if (!s) return notFound(res, 'payment_intent')
    const r = { id: id('re'), object: 'refund', amount: Number(f.amount ?? s.amount_total), currency: s.currency, payment_intent: s.payment_intent, status: 'pending', metadata: f.metadata ?? {} }
    refunds.set(r.id, r)
    json(res, 200, r)
    setTimeout(() => {
      r.status = 'succeeded'
      void send('refund.updated', r)
    }, 50)
    return
  }
  if (req.method === 'GET' && (hit = m(/^\/checkout\/([\w]+)$/))) {
    const s = sessions.get(hit[1])
    if (!s) return notFound(res, 'checkout session')
    res.writeHead(200, { 'content-type': 'text/html; charset=utf-8' })
    return res.end(page(s))
  }
  if (req.method === 'POST' && (hit = m(/^\/checkout\/([\w]+)\/(pay|fail|cancel)$/))) {
    const s = sessions.get(hit[1])
    if (!s) return notFound(res, 'checkout session')
    if (hit[2] === 'pay') {
      Object.assign(s, { status: 'complete', payment_status: 'paid', payment_intent: id('pi') })
      await send('checkout.session.completed', s)
    }
    else if (hit[2] === 'fail') {
      await send('checkout.session.async_payment_failed', { ...s, payment_status: 'unpaid' })
    }
    else {
      Object.assign(s, { status: 'expired' })
      await send('checkout.session.expired', s)
    }
    res.writeHead(303, { location: hit[2] === 'pay' ? s.success_url : s.cancel_url })
    return res.end()
  }
  return notFound(res, 'route')
})
server.listen(Number(values.port), '127.0.0.1', () => console.log(`[payments-fake] listening on http://127.0.0.1:${values.port}`))
const stop = () => server.close(() => process.exit(0))
process.on('SIGTERM', stop)
process.on('SIGINT', stop)
