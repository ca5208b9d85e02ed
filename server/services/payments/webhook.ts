/**
 * The provider's events (POST /api/payments/webhook, open: the signature is the credential).
 *
 * - The signature is verified with the SDK's `webhooks.constructEvent` over the raw body and the
 *   `stripe-signature` header (./stripe.ts). A missing or bad signature — or no webhook secret
 *   configured — answers 400 and is written to the audit trail with the caller's address (at most
 *   AUDITED_REFUSALS per address in ten minutes, so a flood cannot fill the trail); nothing else
 *   changes.
 * - A verified event is kept once by its id (`PaymentEvent`, unique): the same event again — the
 *   provider's retry or a replay of a captured delivery — finds it and changes nothing (200).
 * - `checkout.session.completed` (or `…async_payment_succeeded`) with `payment_status: paid` records
 *   the card payment of the attempt the session was made for (one payment per session), and the
 *   invoice becomes paid when its payments cover it. `checkout.session.expired`,
 *   `…async_payment_failed` and `payment_intent.payment_failed` close or mark the attempt; every other
 *   event type is kept as `ignored`.
 */
import { createError, type H3Event } from 'h3'
import { UniqueConstraintError, type Transaction } from 'sequelize'
import { Invoice } from '#server/models/Invoice'
import { Payment } from '#server/models/Payment'
import { PaymentAttempt } from '#server/models/PaymentAttempt'
import { PaymentEvent } from '#server/models/PaymentEvent'
import { recordAudit, updateAudited } from '#server/utils/audit'
import { config } from '#server/utils/config'
import { writeTransaction } from '#server/utils/db'
import { countHits, recordHits } from '#server/utils/rateLimit'
import { clientAddress, clientUserAgent } from '#server/utils/request'
import { labToday } from '#server/services/settings/today'
import { recordPaymentIn } from '#server/services/billing/invoices'
import { verifiedEvent, type Stripe } from './stripe'

/** Refused deliveries audited per address within REFUSAL_WINDOW_MS; past that they are only counted. */
export const AUDITED_REFUSALS = 30
const REFUSAL_WINDOW_MS = 10 * 60_000

export interface WebhookAnswer {
  received: true
  /** True when the event was handled before: nothing changed. */
  duplicate: boolean
}

async function refuse(event: H3Event, reason: string, signaturePresent: boolean): Promise<never> {
  const address = clientAddress(event)
  const key = `webhook:refused:${address}`
  if ((await countHits(key, REFUSAL_WINDOW_MS)) < AUDITED_REFUSALS) {
    await writeTransaction(t => recordAudit(t, {
      userId: null, action: 'refused-webhook', entity: 'PaymentEvent', entityId: null,
      after: { reason: reason.slice(0, 300), signaturePresent, address, userAgent: clientUserAgent(event) },
    }))
  }
  await recordHits([key])
  throw createError({ statusCode: 400, statusMessage: 'Bad Request', message: 'The event’s signature does not verify', data: { fields: { signature: 'The event’s signature does not verify' } } })
}

/** Verify a delivery and apply its event once; 400 (audited) when the signature does not verify. */
export async function receivePaymentEvent(event: H3Event, rawBody: Buffer | undefined, signature: string | undefined): Promise<WebhookAnswer> {
  const secret = config().payments.webhookSecret
  if (!secret) return refuse(event, 'no webhook secret is configured (STRIPE_WEBHOOK_SECRET)', !!signature)
  if (!signature) return refuse(event, 'no stripe-signature header', false)
  if (!rawBody?.length) return refuse(event, 'no body', true)
  let verified: Stripe.Event
  try {
    verified = verifiedEvent(rawBody, signature, secret)
  }
  catch (err) {
    return refuse(event, (err as Error)?.message ?? 'signature does not verify', true)
  }
  if (!verified || typeof verified.id !== 'string' || typeof verified.type !== 'string') return refuse(event, 'not an event', true)
  try {
    return await writeTransaction(t => applyEventIn(t, verified))
  }
  catch (err) {
    // The same event delivered twice at once: the second finds the first's row on commit.
    if (err instanceof UniqueConstraintError) return { received: true, duplicate: true }
    throw err
  }
}

interface SessionLike { id?: unknown, payment_status?: unknown, amount_total?: unknown, currency?: unknown, metadata?: unknown, last_payment_error?: unknown }

function metadataOf(o: SessionLike): Record<string, string> {
  return o.metadata && typeof o.metadata === 'object' ? o.metadata as Record<string, string> : {}
}

/** The attempt an object (session or payment intent) was made for: by its metadata, else by session id. */
async function attemptFor(t: Transaction, o: SessionLike, bySession: boolean): Promise<PaymentAttempt | null> {
  const id = Number(metadataOf(o).attemptId)
  const byMeta = Number.isInteger(id) && id > 0 ? await PaymentAttempt.findByPk(id, { transaction: t, lock: t.LOCK.UPDATE }) : null
  if (byMeta) return byMeta
  return bySession && typeof o.id === 'string' ? PaymentAttempt.findOne({ where: { sessionId: o.id }, transaction: t, lock: t.LOCK.UPDATE }) : null
}

async function applyEventIn(t: Transaction, e: Stripe.Event): Promise<WebhookAnswer> {
  if (await PaymentEvent.findOne({ where: { eventId: e.id }, attributes: ['id'], transaction: t })) return { received: true, duplicate: true }
  const o = (e.data?.object ?? {}) as SessionLike
  const objectId = typeof o.id === 'string' ? o.id.slice(0, 200) : null
  let outcome = 'ignored'
  let invoiceId: number | null = null
  switch (e.type) {
    case 'checkout.session.completed':
    case 'checkout.session.async_payment_succeeded': {
      if (o.payment_status !== 'paid') break
      const attempt = await attemptFor(t, o, true)
      if (!attempt || (attempt.sessionId && attempt.sessionId !== objectId)) {
        outcome = 'unmatched'
        break
      }
      invoiceId = attempt.invoiceId
      const invoice = await Invoice.findByPk(attempt.invoiceId, { transaction: t, lock: t.LOCK.UPDATE })
      const amount = Number(o.amount_total)
      if (!invoice || !Number.isInteger(amount) || amount <= 0 || String(o.currency).toUpperCase() !== invoice.currency) {
        outcome = 'amount-mismatch'
        break
      }
      if (await Payment.findOne({ where: { providerReference: objectId }, attributes: ['id'], transaction: t })) {
        outcome = 'already-paid'
        break
      }
      await recordPaymentIn(t, invoice, {
        method: 'card', amountMinor: amount, receivedOn: await labToday(new Date(), t), reference: `Card payment, session ${objectId}`,
        provider: 'stripe', providerReference: objectId, eventId: e.id, actorId: null,
      })
      await updateAudited(t, null, attempt, { status: 'paid', sessionId: attempt.sessionId ?? objectId, completedAt: new Date(), failure: null }, { entity: 'PaymentAttempt', action: 'paid' })
      outcome = 'applied'
      break
    }
    case 'checkout.session.expired':
    case 'checkout.session.async_payment_failed': {
      const attempt = await attemptFor(t, o, true)
      if (!attempt) {
        outcome = 'unmatched'
        break
      }
      invoiceId = attempt.invoiceId
      if (attempt.status !== 'paid') {
        await updateAudited(t, null, attempt, { status: e.type === 'checkout.session.expired' ? 'expired' : 'failed', completedAt: new Date() }, { entity: 'PaymentAttempt', action: e.type === 'checkout.session.expired' ? 'expire' : 'fail' })
      }
      outcome = 'applied'
      break
    }
    case 'payment_intent.payment_failed': {
      const attempt = await attemptFor(t, o, false)
      if (!attempt) {
        outcome = 'unmatched'
        break
      }
      invoiceId = attempt.invoiceId
      const err = o.last_payment_error && typeof o.last_payment_error === 'object' ? (o.last_payment_error as { message?: unknown }).message : null
      if (attempt.status !== 'paid') {
        await updateAudited(t, null, attempt, { status: 'failed', failure: typeof err === 'string' ? err.slice(0, 500) : 'The card payment failed' }, { entity: 'PaymentAttempt', action: 'fail' })
      }
      outcome = 'applied'
      break
    }
  }
  await PaymentEvent.create({ eventId: e.id.slice(0, 200), type: e.type.slice(0, 100), objectId, outcome, invoiceId, receivedAt: new Date() }, { transaction: t })
  if (outcome !== 'ignored') await recordAudit(t, { userId: null, action: 'payment-event', entity: 'PaymentEvent', entityId: null, after: { eventId: e.id, type: e.type, objectId, outcome, invoiceId } })
  return { received: true, duplicate: false }
}
