import { LAB_ROLES } from '../../../shared/roles'
import { customerQuerySchema } from '../../../shared/schemas/registerQuery'
import { requireRole } from '../../utils/access'
import { listCustomers } from '../../utils/registersCustomers'
import { parseWith } from '../../utils/validation'

/** Customer organizations with their address and number of active contacts, paged on the server. */
export default defineEventHandler(async (event) => {
  await requireRole(event, ...LAB_ROLES)
  const q = await getValidatedQuery(event, parseWith(customerQuerySchema))
  return await listCustomers(q)
})
