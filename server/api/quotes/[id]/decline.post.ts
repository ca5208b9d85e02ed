import { quoteDeclineSchema } from '#shared/schemas/billing'
import { idParamSchema } from '#shared/schemas/common'
import { declineQuote } from '#server/services/billing/quotes'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** The customer declines a quote, saying why. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'quote:respond')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(quoteDeclineSchema))
  return declineQuote(user, id, input)
})
