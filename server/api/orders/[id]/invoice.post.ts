import { orderInvoiceSchema } from '#shared/schemas/billing'
import { idParamSchema } from '#shared/schemas/common'
import { invoiceOrderByHand } from '#server/services/billing/invoices'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Invoice an order now, by hand (409 when it is invoiced already). */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'billing:manage')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(orderInvoiceSchema))
  setResponseStatus(event, 201)
  return invoiceOrderByHand(user, id, input)
})
