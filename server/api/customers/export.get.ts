import { LAB_ROLES } from '../../../shared/roles'
import { customerQuerySchema } from '../../../shared/schemas/registerQuery'
import { requireRole } from '../../utils/access'
import { exportCustomers } from '../../utils/registersCustomers'
import { parseWith } from '../../utils/validation'

/** CSV of the customers matching the list's filters: one row per active contact (or one row without). */
export default defineEventHandler(async (event) => {
  await requireRole(event, ...LAB_ROLES)
  const q = await getValidatedQuery(event, parseWith(customerQuerySchema))
  return await exportCustomers(event, q)
})
