import { LAB_ROLES } from '../../../shared/roles'
import { idParamSchema } from '../../../shared/schemas/common'
import { requireRole } from '../../utils/access'
import { SOURCE_REGISTER, equipmentDetail } from '../../utils/registersEquipment'
import { parseWith } from '../../utils/validation'

/** One blackbody source with its calibration history (newest first) and its audit trail. */
export default defineEventHandler(async (event) => {
  await requireRole(event, ...LAB_ROLES)
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  return await equipmentDetail(SOURCE_REGISTER, id)
})
