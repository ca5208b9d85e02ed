import { quoteUpdateSchema } from '#shared/schemas/billing'
import { idParamSchema } from '#shared/schemas/common'
import { updateQuote } from '#server/services/billing/quotes'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Edit a draft quote's lines, message and validity. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'billing:manage')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(quoteUpdateSchema))
  return updateQuote(user, id, input)
})
