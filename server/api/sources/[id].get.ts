import { idParamSchema } from '#shared/schemas/common'
import { requirePermission } from '#server/utils/access'
import { SOURCE_REGISTER, equipmentDetail } from '#server/services/equipment/equipment'
import { parseWith } from '#server/utils/validation'

/** One blackbody source with its calibration history (newest first) and its audit trail. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'equipment:read')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  return await equipmentDetail(SOURCE_REGISTER, id)
})
