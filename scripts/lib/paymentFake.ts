/**
 * A local stand-in for the card payment provider, for the demo, development and tests: bound to
 * 127.0.0.1 only, it answers the calls of the `stripe` Node SDK that Bandlight makes (the SDK is
 * pointed here with its `host`, `port` and `protocol` options through STRIPE_API_BASE) and shows a
 * small hosted payment page. Nothing here is the provider's own software or look; no money moves.
 *
 * - `POST /v1/checkout/sessions` (form-encoded, `Authorization: Bearer <secret key>`, honouring
 *   `Idempotency-Key`), `GET /v1/checkout/sessions/:id`, `POST /v1/checkout/sessions/:id/expire`;
 *   errors in the provider's JSON shape (`{ error: { type, message, param } }`).
 * - `GET /pay/:id` — the hosted page: what is paid for and the total, "Pay" and "Decline".
 *   Pay completes the session, delivers `checkout.session.completed` and sends the browser to the
 *   session's success URL; Decline delivers `payment_intent.payment_failed` (the session stays open,
 *   as a declined card leaves it) and offers to try again or go back (the cancel URL).
 * - Events go to `webhookUrl` as JSON with a `stripe-signature` header made the way the SDK's
 *   `webhooks.constructEvent` checks it: `t=<unix seconds>,v1=<hex HMAC-SHA256 of "t.body" keyed
 *   with the webhook secret>`. Failed deliveries are retried (1, 2, 4 … s, five times).
 * - For tests: `GET /_fake/events` lists what was delivered (body, signature, answers) and
 *   `POST /_fake/events/:id/resend` delivers an event again, freshly signed.
 */
import crypto from 'node:crypto'
import http from 'node:http'

export interface PaymentFakeOptions {
  /** 0 = any free port. */
  port: number
  /** Where events are delivered (Bandlight's POST /api/payments/webhook). */
  webhookUrl: string
  /** The key the SDK must present (STRIPE_SECRET_KEY). */
  secretKey: string
  /** The key events are signed with (STRIPE_WEBHOOK_SECRET). */
  webhookSecret: string
  quiet?: boolean
}

export interface DeliveredEvent {
  id: string
  type: string
  body: string
  signature: string
  /** HTTP status of each delivery attempt (0: no answer). */
  answers: number[]
}

export interface PaymentFake {
  port: number
  /** `http://127.0.0.1:<port>`: STRIPE_API_BASE for the server. */
  url: string
  events(): DeliveredEvent[]
  close(): Promise<void>
}

type Json = Record<string, unknown>

/** A new secret pair for one run of the fake (the server gets the same values). */
export function fakeSecrets(): { secretKey: string, webhookSecret: string } {
  return { secretKey: `sk_test_bandlight_${crypto.randomBytes(12).toString('hex')}`, webhookSecret: `whsec_${crypto.randomBytes(24).toString('base64url')}` }
}

/** The `stripe-signature` header for a body at a time (unix seconds). */
export function signatureFor(body: string, secret: string, timestamp = Math.floor(Date.now() / 1000)): string {
  const v1 = crypto.createHmac('sha256', secret).update(`${timestamp}.${body}`, 'utf8').digest('hex')
  return `t=${timestamp},v1=${v1}`
}

/** The SDK's form encoding (`line_items[0][price_data][currency]=gbp`) as nested objects and arrays. */
export function parseForm(body: string): Json {
  const out: Json = {}
  for (const [key, value] of new URLSearchParams(body)) {
    const path = key.replace(/\]/g, '').split('[')
    let node: Json | unknown[] = out
    path.forEach((seg, i) => {
      const last = i === path.length - 1
      const nextIsIndex = !last && /^\d+$/.test(path[i + 1]!)
      const k = Array.isArray(node) ? Number(seg) : seg
      const holder = node as Record<string | number, unknown>
      if (last) holder[k] = value
      else {
        holder[k] ??= nextIsIndex ? [] : {}
        node = holder[k] as Json | unknown[]
      }
    })
  }
  return out
}

const id = (prefix: string) => `${prefix}_${crypto.randomBytes(12).toString('hex')}`
const esc = (s: string) => s.replace(/[&<>"']/g, c => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', '\'': '&#39;' })[c]!)

function money(minor: number, currency: string): string {
  try {
    const digits = new Intl.NumberFormat('en', { style: 'currency', currency }).resolvedOptions().maximumFractionDigits ?? 2
    return new Intl.NumberFormat('en-GB', { style: 'currency', currency }).format(minor / 10 ** digits)
  }
  catch {
    return `${currency.toUpperCase()} ${minor}`
  }
}

function page(title: string, body: string): string {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1"><title>${esc(title)}</title>
<style>
body{margin:0;font-family:system-ui,sans-serif;background:#eef1f4;color:#1f2933}
main{max-width:26rem;margin:2.5rem auto;background:#fff;border:1px solid #cfd6dd;border-radius:8px;padding:1.5rem}
.note{font-size:.8rem;background:#fff7d6;border:1px solid #e8d48a;border-radius:4px;padding:.5rem .75rem;margin-bottom:1rem}
h1{font-size:1.15rem;margin:0 0 1rem}.total{font-size:1.6rem;font-weight:700;margin:.25rem 0 1rem}
table{width:100%;border-collapse:collapse;font-size:.9rem;margin-bottom:1rem}td{padding:.3rem 0;border-bottom:1px solid #e4e8ec}td.n{text-align:right}
label{display:block;font-size:.8rem;color:#52606d;margin:.5rem 0 .2rem}input{width:100%;box-sizing:border-box;padding:.45rem;border:1px solid #cfd6dd;border-radius:4px;font:inherit;background:#f7f9fa}
.row{display:flex;gap:.5rem;margin-top:1rem}button,a.b{flex:1;padding:.6rem;border-radius:4px;border:1px solid #33475b;font:inherit;font-weight:600;cursor:pointer;text-align:center;text-decoration:none}
.pay{background:#33475b;color:#fff}.decline{background:#fff;color:#33475b}.bad{color:#a61b1b;font-weight:600}
</style></head><body><main><p class="note">Local test payment page — no real card is charged.</p>${body}</main></body></html>`
}

export async function startPaymentFake(opts: PaymentFakeOptions): Promise<PaymentFake> {
  const sessions = new Map<string, Json>()
  const byIdempotency = new Map<string, string>()
  const delivered: DeliveredEvent[] = []
  let base = ''
  const log = (s: string) => { if (!opts.quiet) console.log(`[payment fake] ${s}`) }

  async function deliverOnce(ev: DeliveredEvent, signature: string): Promise<number> {
    try {
      const res = await fetch(opts.webhookUrl, {
        method: 'POST',
        headers: { 'content-type': 'application/json; charset=utf-8', 'stripe-signature': signature, 'user-agent': 'BandlightPaymentFake/1.0' },
        body: ev.body,
        signal: AbortSignal.timeout(10_000),
      })
      await res.arrayBuffer()
      return res.status
    }
    catch {
      return 0
    }
  }

  /** Deliver an event (awaiting the first attempt), retrying in the background while it is refused. */
  async function emit(type: string, object: Json): Promise<DeliveredEvent> {
    const event = { id: id('evt'), object: 'event', api_version: null, created: Math.floor(Date.now() / 1000), data: { object }, livemode: false, pending_webhooks: 1, request: { id: null, idempotency_key: null }, type }
    const body = JSON.stringify(event, null, 2)
    const ev: DeliveredEvent = { id: event.id, type, body, signature: signatureFor(body, opts.webhookSecret), answers: [] }
    delivered.push(ev)
    const status = await deliverOnce(ev, ev.signature)
    ev.answers.push(status)
    log(`${type} → ${status || 'no answer'}`)
    if (status < 200 || status >= 300) {
      void (async () => {
        for (let i = 0; i < 5; i++) {
          await new Promise(r => setTimeout(r, 1000 * 2 ** i).unref())
          const again = await deliverOnce(ev, signatureFor(body, opts.webhookSecret))
          ev.answers.push(again)
          if (again >= 200 && again < 300) return
        }
      })()
    }
    return ev
  }

  function send(res: http.ServerResponse, status: number, body: unknown) {
    res.writeHead(status, { 'content-type': 'application/json', 'request-id': id('req') })
    res.end(JSON.stringify(body))
  }
  const apiError = (res: http.ServerResponse, status: number, message: string, param?: string, type = 'invalid_request_error') =>
    send(res, status, { error: { type, message, ...(param ? { param } : {}) } })
  function html(res: http.ServerResponse, status: number, body: string) {
    res.writeHead(status, { 'content-type': 'text/html; charset=utf-8', 'cache-control': 'no-store' })
    res.end(body)
  }

  function createSession(form: Json): Json | string {
    if (form.mode !== 'payment') return 'mode: only "payment" is supported here'
    const items = Array.isArray(form.line_items) ? form.line_items as Json[] : []
    if (!items.length) return 'line_items: at least one line item'
    let total = 0
    let currency = ''
    for (const item of items) {
      const pd = (item.price_data ?? {}) as Json
      const amount = Number(pd.unit_amount)
      const qty = Number(item.quantity ?? 1)
      if (!Number.isInteger(amount) || amount < 0 || !Number.isInteger(qty) || qty < 1) return 'line_items: unit_amount and quantity must be whole numbers'
      if (currency && pd.currency !== currency) return 'line_items: one currency per session'
      currency = String(pd.currency ?? '')
      total += amount * qty
    }
    if (!/^[a-z]{3}$/.test(currency)) return 'line_items[0][price_data][currency]: a three-letter currency'
    if (typeof form.success_url !== 'string' || typeof form.cancel_url !== 'string') return 'success_url and cancel_url are required'
    const sid = `cs_test_${crypto.randomBytes(16).toString('hex')}`
    const now = Math.floor(Date.now() / 1000)
    const session: Json = {
      id: sid, object: 'checkout.session', amount_subtotal: total, amount_total: total, currency,
      client_reference_id: form.client_reference_id ?? null, customer_email: form.customer_email ?? null,
      created: now, expires_at: now + 24 * 3600, livemode: false, metadata: form.metadata ?? {}, mode: 'payment',
      payment_intent: null, payment_status: 'unpaid', status: 'open',
      success_url: form.success_url, cancel_url: form.cancel_url, url: `${base}/pay/${sid}`,
      line_items_shown: items.map(i => ({ name: String(((i.price_data as Json)?.product_data as Json)?.name ?? 'Item'), quantity: Number(i.quantity ?? 1), amount: Number((i.price_data as Json).unit_amount) })),
      payment_intent_metadata: (form.payment_intent_data as Json | undefined)?.metadata ?? {},
    }
    sessions.set(sid, session)
    return session
  }

  /** The session as the API returns it (without the fake's own bookkeeping). */
  const publicSession = (s: Json) => {
    const { line_items_shown: _l, payment_intent_metadata: _m, ...rest } = s
    return rest
  }

  function payPage(s: Json, message = ''): string {
    const lines = (s.line_items_shown as { name: string, quantity: number, amount: number }[])
      .map(l => `<tr><td>${esc(l.name)}${l.quantity > 1 ? ` × ${l.quantity}` : ''}</td><td class="n">${esc(money(l.amount * l.quantity, String(s.currency)))}</td></tr>`).join('')
    return page('Pay', `<h1>Payment</h1>${message}<table>${lines}</table><div>Total</div><div class="total" data-testid="fake-total">${esc(money(Number(s.amount_total), String(s.currency)))}</div>
<form method="post" action="/pay/${esc(String(s.id))}">
<label for="card">Card number (test)</label><input id="card" value="4242 4242 4242 4242" readonly>
<div class="row"><button class="pay" name="action" value="pay" data-testid="fake-pay">Pay</button><button class="decline" name="action" value="decline" data-testid="fake-decline">Decline</button></div>
</form>`)
  }

  async function readBody(req: http.IncomingMessage): Promise<string> {
    const chunks: Buffer[] = []
    let size = 0
    for await (const c of req) {
      size += (c as Buffer).length
      if (size > 256 * 1024) throw new Error('body too large')
      chunks.push(c as Buffer)
    }
    return Buffer.concat(chunks).toString('utf8')
  }

  const server = http.createServer((req, res) => {
    void (async () => {
      const url = new URL(req.url ?? '/', base || 'http://127.0.0.1')
      const p = url.pathname
      try {
        // ---- the SDK's calls
        if (p.startsWith('/v1/')) {
          if (req.headers.authorization !== `Bearer ${opts.secretKey}`) return apiError(res, 401, 'Invalid API Key provided')
          const body = req.method === 'POST' ? await readBody(req) : ''
          if (p === '/v1/checkout/sessions' && req.method === 'POST') {
            const key = req.headers['idempotency-key']
            const again = typeof key === 'string' ? byIdempotency.get(key) : undefined
            if (again) return send(res, 200, publicSession(sessions.get(again)!))
            const made = createSession(parseForm(body))
            if (typeof made === 'string') return apiError(res, 400, made, made.split(':')[0])
            if (typeof key === 'string') byIdempotency.set(key, String(made.id))
            log(`session ${String(made.id)} for ${money(Number(made.amount_total), String(made.currency))}`)
            return send(res, 200, publicSession(made))
          }
          const m = /^\/v1\/checkout\/sessions\/([\w-]+)(\/expire)?$/.exec(p)
          const s = m ? sessions.get(m[1]!) : undefined
          if (m && !s) return apiError(res, 404, `No such checkout.session: '${m[1]}'`, 'id')
          if (s && !m![2] && req.method === 'GET') return send(res, 200, publicSession(s))
          if (s && m![2] && req.method === 'POST') {
            if (s.status !== 'open') return apiError(res, 400, `Only an open session can be expired (this one is ${String(s.status)})`)
            s.status = 'expired'
            await emit('checkout.session.expired', publicSession(s))
            return send(res, 200, publicSession(s))
          }
          return apiError(res, 404, `Unrecognized request URL (${req.method}: ${p})`)
        }
        // ---- the hosted page
        const pm = /^\/pay\/([\w-]+)$/.exec(p)
        if (pm) {
          const s = sessions.get(pm[1]!)
          if (!s) return html(res, 404, page('Not found', '<h1>No such payment</h1>'))
          if (req.method === 'GET') {
            if (s.status !== 'open') return html(res, 200, page('Payment', `<h1>This payment is ${esc(String(s.status))}</h1><p><a href="${esc(String(s.success_url).replace('{CHECKOUT_SESSION_ID}', String(s.id)))}">Back</a></p>`))
            return html(res, 200, payPage(s))
          }
          if (req.method === 'POST') {
            const action = new URLSearchParams(await readBody(req)).get('action')
            if (s.status !== 'open') return html(res, 409, page('Payment', `<h1>This payment is ${esc(String(s.status))}</h1>`))
            if (action === 'pay') {
              s.status = 'complete'
              s.payment_status = 'paid'
              s.payment_intent = id('pi')
              await emit('checkout.session.completed', publicSession(s))
              res.writeHead(303, { location: String(s.success_url).replace('{CHECKOUT_SESSION_ID}', String(s.id)) })
              return res.end()
            }
            if (action === 'decline') {
              const intent = {
                id: id('pi'), object: 'payment_intent', amount: s.amount_total, currency: s.currency, status: 'requires_payment_method', metadata: s.payment_intent_metadata,
                last_payment_error: { type: 'card_error', code: 'card_declined', decline_code: 'generic_decline', message: 'Your card was declined.' },
              }
              await emit('payment_intent.payment_failed', intent)
              const back = `<div class="row"><a class="b pay" href="/pay/${esc(String(s.id))}" data-testid="fake-retry">Try again</a><a class="b decline" href="${esc(String(s.cancel_url))}" data-testid="fake-back">Back to the invoice</a></div>`
              return html(res, 402, page('Payment declined', `<h1>Payment</h1><p class="bad" data-testid="fake-declined">Your card was declined. Nothing was charged.</p>${back}`))
            }
            return html(res, 400, page('Payment', '<h1>Choose Pay or Decline</h1>'))
          }
        }
        // ---- for tests
        if (p === '/_fake/events' && req.method === 'GET') return send(res, 200, delivered)
        const rm = /^\/_fake\/events\/([\w-]+)\/resend$/.exec(p)
        if (rm && req.method === 'POST') {
          const ev = delivered.find(e => e.id === rm[1])
          if (!ev) return apiError(res, 404, 'No such event')
          const status = await deliverOnce(ev, signatureFor(ev.body, opts.webhookSecret))
          ev.answers.push(status)
          return send(res, 200, { status })
        }
        html(res, 404, page('Not found', '<h1>Not found</h1>'))
      }
      catch (err) {
        apiError(res, 500, (err as Error).message, undefined, 'api_error')
      }
    })()
  })
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject)
    server.listen(opts.port, '127.0.0.1', () => {
      server.off('error', reject)
      resolve()
    })
  })
  const port = (server.address() as { port: number }).port
  base = `http://127.0.0.1:${port}`
  return {
    port,
    url: base,
    events: () => delivered,
    close: () => new Promise<void>((resolve) => {
      server.closeAllConnections()
      server.close(() => resolve())
    }),
  }
}
