import { idParamSchema } from '#shared/schemas/common'
import { complaintApproveSchema } from '#shared/schemas/complaint'
import { approveOutcome } from '#server/services/complaints/complaints'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Approve the outcome and close, with the closing notice mailed; 403 for anyone involved in the work complained about. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'complaint:approve')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(complaintApproveSchema))
  return await approveOutcome(user, id, input)
})
