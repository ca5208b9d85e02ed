import { orderReturnSchema } from '#shared/schemas/billing'
import { idParamSchema } from '#shared/schemas/common'
import { recordReturn } from '#server/services/billing/orders'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Record that the order's instruments went back, with the carrier's tracking reference (the customer is told). */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'order:ship')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(orderReturnSchema))
  return recordReturn(user, id, input)
})
