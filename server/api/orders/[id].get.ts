import { idParamSchema } from '#shared/schemas/common'
import { orderDetail } from '#server/services/billing/orders'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'order:read')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  return orderDetail(user, id)
})
