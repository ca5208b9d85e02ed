import { quoteCreateSchema } from '#shared/schemas/billing'
import { createQuote } from '#server/services/billing/quotes'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** A draft quote for a reviewed request, its lines from the current price list. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'billing:manage')
  const input = await readValidatedBody(event, parseWith(quoteCreateSchema))
  setResponseStatus(event, 201)
  return createQuote(user, input)
})
