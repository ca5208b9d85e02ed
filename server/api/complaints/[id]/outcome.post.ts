import { idParamSchema } from '#shared/schemas/common'
import { complaintOutcomeSchema } from '#shared/schemas/complaint'
import { proposeOutcome } from '#server/services/complaints/complaints'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Propose the outcome, for approval by someone not involved in the work complained about. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'complaint:handle')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(complaintOutcomeSchema))
  return await proposeOutcome(user, id, input)
})
