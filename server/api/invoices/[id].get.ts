import { idParamSchema } from '#shared/schemas/common'
import { invoiceDetail } from '#server/services/billing/invoices'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'invoice:read')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  return invoiceDetail(user, id)
})
