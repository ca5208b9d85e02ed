import { idParamSchema } from '#shared/schemas/common'
import { checkPlanDetail } from '#server/services/checks/checks'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** A check plan with its results (newest first) and audit trail. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'check:read')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  return await checkPlanDetail(id)
})
