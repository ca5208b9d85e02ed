import { quoteSendSchema } from '#shared/schemas/billing'
import { idParamSchema } from '#shared/schemas/common'
import { sendQuote } from '#server/services/billing/quotes'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Send a draft quote to the customer (its PDF is drawn and kept). */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'billing:manage')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(quoteSendSchema))
  return sendQuote(user, id, input)
})
