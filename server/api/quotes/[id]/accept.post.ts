import { quoteAcceptSchema } from '#shared/schemas/billing'
import { idParamSchema } from '#shared/schemas/common'
import { acceptQuote } from '#server/services/billing/quotes'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** The customer accepts a quote with its purchase-order number: the order is made. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'quote:respond')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(quoteAcceptSchema))
  return acceptQuote(user, id, input)
})
