import { idParamSchema } from '#shared/schemas/common'
import { complaintDetail } from '#server/services/complaints/complaints'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** A complaint (a customer: its own organization's only, 404 otherwise, without the laboratory's internal notes). */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'complaint:read')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  return await complaintDetail(user, id)
})
