import { customerQuerySchema } from '#shared/schemas/registerQuery'
import { requirePermission } from '#server/utils/access'
import { listCustomers } from '#server/services/customers/customers'
import { parseWith } from '#server/utils/validation'

/** Customer organizations with their address and number of active contacts, paged on the server. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'customer:read')
  const q = await getValidatedQuery(event, parseWith(customerQuerySchema))
  return await listCustomers(q)
})
