import { customerQuerySchema } from '#shared/schemas/registerQuery'
import { requirePermission } from '#server/utils/access'
import { exportCustomers } from '#server/services/customers/customers'
import { parseWith } from '#server/utils/validation'

/** CSV of the customers matching the list's filters: one row per active contact (or one row without). */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'customer:read')
  const q = await getValidatedQuery(event, parseWith(customerQuerySchema))
  return await exportCustomers(event, q)
})
