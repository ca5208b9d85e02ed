/**
 * Card payment of an invoice through the provider's hosted checkout: the customer asks to pay, a
 * `PaymentAttempt` is recorded for the invoice's balance, a checkout session is made with the SDK
 * (outside any database transaction) and the customer is sent to its page. Nothing is paid here:
 * the invoice becomes paid only when the provider's signed event says so (./webhook.ts).
 */
import { createError, type H3Event } from 'h3'
import type { SessionUser } from '#shared/types'
import type { CheckoutDTO } from '#shared/types/billing'
import { PaymentAttempt } from '#server/models/PaymentAttempt'
import { User } from '#server/models/User'
import { createAudited, updateAudited } from '#server/utils/audit'
import { conflict } from '#server/utils/errors'
import { serverOrigin } from '#server/utils/request'
import { inTransaction } from '#server/utils/transaction'
import { balanceOf, findInvoice } from '#server/services/billing/invoices'
import { stripeClient } from './stripe'

/**
 * Start paying an invoice by card: the URL of the hosted payment page. The customer comes back to
 * the invoice at the address it paid from. 409 when card payment is not set up or nothing is owed;
 * 502 when the provider cannot be reached (the attempt is kept as failed).
 */
export async function startCheckout(event: H3Event, user: SessionUser, invoiceId: number): Promise<CheckoutDTO> {
  const stripe = stripeClient()
  if (!stripe) conflict('Card payment is not set up for this laboratory: please pay by bank transfer', 'payment')
  const invoice = await findInvoice(user, invoiceId)
  const { balanceMinor } = await balanceOf(invoice)
  if (invoice.status !== 'open' || balanceMinor <= 0) conflict('Nothing is left to pay on this invoice', 'payment')
  const attempt = await inTransaction(t => createAudited(t, user, PaymentAttempt, {
    invoiceId: invoice.id, provider: 'stripe', sessionId: null, amountMinor: balanceMinor, currency: invoice.currency,
    status: 'open', failure: null, completedAt: null, createdBy: user.id,
  }, { entity: 'PaymentAttempt', action: 'start-card-payment', extra: { invoice: invoice.number } }))
  const back = `${serverOrigin(event)}/invoices/${invoice.id}`
  const email = (await User.findByPk(user.id, { attributes: ['email'] }))?.email
  const metadata = { invoiceId: String(invoice.id), invoiceNumber: invoice.number, attemptId: String(attempt.id) }
  let session: Awaited<ReturnType<typeof stripe.checkout.sessions.create>>
  try {
    session = await stripe.checkout.sessions.create({
      mode: 'payment',
      line_items: [{ quantity: 1, price_data: { currency: invoice.currency.toLowerCase(), unit_amount: balanceMinor, product_data: { name: `Invoice ${invoice.number}` } } }],
      client_reference_id: String(invoice.id),
      customer_email: email,
      metadata,
      payment_intent_data: { metadata },
      success_url: `${back}?payment=done`,
      cancel_url: `${back}?payment=cancelled`,
    }, { idempotencyKey: `bandlight-attempt-${attempt.id}` })
  }
  catch (err) {
    await inTransaction(t => updateAudited(t, user, attempt, { status: 'failed', failure: `The payment service did not answer: ${String((err as Error)?.message ?? err).slice(0, 300)}` }, { entity: 'PaymentAttempt', action: 'fail' }))
    throw createError({ statusCode: 502, statusMessage: 'Bad Gateway', message: 'The payment service did not answer; please try again in a moment', data: { fields: { payment: 'The payment service did not answer' } } })
  }
  await inTransaction(t => updateAudited(t, user, attempt, { sessionId: session.id }, { entity: 'PaymentAttempt', action: 'open-session' }))
  if (!session.url) throw createError({ statusCode: 502, statusMessage: 'Bad Gateway', message: 'The payment service gave no payment page' })
  return { url: session.url }
}
