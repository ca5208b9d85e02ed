import { idParamSchema } from '#shared/schemas/common'
import { checkResultCreateSchema } from '#shared/schemas/check'
import { recordCheck } from '#server/services/checks/checks'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/**
 * Record one check under the plan. A failure takes the item out of service and raises a
 * nonconformity over the work done with it since the last good evidence (both in the answer).
 */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'check:record')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(checkResultCreateSchema))
  const recorded = await recordCheck(user, id, input)
  setResponseStatus(event, 201)
  return recorded
})
