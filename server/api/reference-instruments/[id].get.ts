import { idParamSchema } from '#shared/schemas/common'
import { requirePermission } from '#server/utils/access'
import { REFERENCE_REGISTER, equipmentDetail } from '#server/services/equipment/equipment'
import { parseWith } from '#server/utils/validation'

/** One reference instrument with its calibration history (newest first) and its audit trail. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'equipment:read')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  return await equipmentDetail(REFERENCE_REGISTER, id)
})
