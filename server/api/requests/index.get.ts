import { requestQuerySchema } from '../../../shared/schemas/request'
import { requireRole } from '../../utils/access'
import { listRequests } from '../../utils/requests'
import { parseWith } from '../../utils/validation'

/** The laboratory's queue of calibration requests; a customer sees its own organization's. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin', 'technician', 'quality', 'customer')
  const q = await getValidatedQuery(event, parseWith(requestQuerySchema))
  return await listRequests(user, q)
})
