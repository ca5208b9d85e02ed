import { idParamSchema } from '#shared/schemas/common'
import { startCheckout } from '#server/services/payments/checkout'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Start paying an invoice by card: the hosted payment page's address. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'invoice:pay')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  return startCheckout(event, user, id)
})
