import { orderQuerySchema } from '#shared/schemas/billing'
import { listOrders } from '#server/services/billing/orders'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Orders, newest first, with where each stands (a customer: its organization's). */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'order:read')
  const q = await getValidatedQuery(event, parseWith(orderQuerySchema))
  return listOrders(user, q)
})
