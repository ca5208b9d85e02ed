/**
 * The payment provider's Node SDK (`stripe`), configured only from server/utils/config.ts:
 * STRIPE_SECRET_KEY (card payment is off without it), STRIPE_WEBHOOK_SECRET (events are verified
 * with it) and STRIPE_API_BASE (the SDK's `host`, `port` and `protocol` options point it at another
 * server — the local fake of demo, development and tests, scripts/lib/paymentFake.ts).
 */
import Stripe from 'stripe'
import { config } from '#server/utils/config'

let cached: { key: string, base: string | null, client: Stripe } | null = null

/** The SDK client, or null when card payment is not configured. */
export function stripeClient(): Stripe | null {
  const { secretKey, apiBase } = config().payments
  if (!secretKey) return null
  if (cached?.key === secretKey && cached.base === apiBase) return cached.client
  const options: Stripe.StripeConfig = { maxNetworkRetries: 1, timeout: 20_000, telemetry: false }
  if (apiBase) {
    const url = new URL(apiBase)
    const protocol = url.protocol === 'https:' ? 'https' : 'http'
    options.host = url.hostname
    options.port = Number(url.port) || (protocol === 'https' ? 443 : 80)
    options.protocol = protocol
  }
  cached = { key: secretKey, base: apiBase, client: new Stripe(secretKey, options) }
  return cached.client
}

/**
 * The event a webhook delivery carries, verified with the SDK's `webhooks.constructEvent` against
 * the raw body, the `stripe-signature` header and STRIPE_WEBHOOK_SECRET (HMAC-SHA256 over
 * "timestamp.body", within the SDK's default tolerance of 300 s). Throws when it does not verify.
 */
export function verifiedEvent(rawBody: Buffer, signature: string, secret: string): Stripe.Event {
  return Stripe.webhooks.constructEvent(rawBody, signature, secret)
}

export type { Stripe }
