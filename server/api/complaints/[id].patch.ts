import { idParamSchema } from '#shared/schemas/common'
import { complaintInvestigationSchema } from '#shared/schemas/complaint'
import { investigateComplaint } from '#server/services/complaints/complaints'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Record the investigation (and the nonconformity it led to, if any). */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'complaint:handle')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(complaintInvestigationSchema))
  return await investigateComplaint(user, id, input)
})
