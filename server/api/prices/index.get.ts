import { priceLists } from '#server/services/billing/prices'
import { requirePermission } from '#server/utils/access'

/** The current price list and its earlier versions. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'billing:manage')
  return priceLists()
})
