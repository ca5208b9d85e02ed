import { receivePaymentEvent } from '#server/services/payments/webhook'

/**
 * The payment provider's events. Open (no session): the `stripe-signature` header over the raw body
 * is the credential — 400 (audited) when it is missing or does not verify, 200 for a verified event,
 * also when it was received before (nothing changes then).
 */
export default defineEventHandler(async (event) => {
  const raw = await readRawBody(event, false)
  return receivePaymentEvent(event, raw ?? undefined, getRequestHeader(event, 'stripe-signature'))
})
