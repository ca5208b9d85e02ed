import { idParamSchema } from '#shared/schemas/common'
import { requirePermission } from '#server/utils/access'
import { instrumentHistory } from '#server/services/instruments/history'
import { parseWith } from '#server/utils/validation'

/** Error at each temperature across the instrument's certified calibrations (customers: own organization only). */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'instrument:read')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  return await instrumentHistory(user, id)
})
