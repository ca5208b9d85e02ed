import { priceListSchema } from '#shared/schemas/billing'
import { savePriceList } from '#server/services/billing/prices'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Save the price list as its next version (audited; earlier versions are kept unchanged). */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'billing:manage')
  const input = await readValidatedBody(event, parseWith(priceListSchema))
  setResponseStatus(event, 201)
  return savePriceList(user, input)
})
