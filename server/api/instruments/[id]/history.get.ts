import { idParamSchema } from '../../../../shared/schemas/common'
import { requireRole } from '../../../utils/access'
import { instrumentHistory } from '../../../utils/instrumentHistory'
import { parseWith } from '../../../utils/validation'

/** Error at each temperature across the instrument's certified calibrations (customers: own organization only). */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin', 'technician', 'quality', 'customer')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  return await instrumentHistory(user, id)
})
