import { quoteQuerySchema } from '#shared/schemas/billing'
import { listQuotes } from '#server/services/billing/quotes'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Quotes, newest first (a customer: its organization's, never drafts). */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'quote:read')
  const q = await getValidatedQuery(event, parseWith(quoteQuerySchema))
  return listQuotes(user, q)
})
