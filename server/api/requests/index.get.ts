import { requestQuerySchema } from '#shared/schemas/request'
import { requirePermission } from '#server/utils/access'
import { listRequests } from '#server/services/requests/requests'
import { parseWith } from '#server/utils/validation'

/** The laboratory's queue of calibration requests; a customer sees its own organization's. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'request:read')
  const q = await getValidatedQuery(event, parseWith(requestQuerySchema))
  return await listRequests(user, q)
})
