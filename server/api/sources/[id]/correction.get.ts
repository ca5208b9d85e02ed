import { idParamSchema } from '#shared/schemas/common'
import { correctionQuerySchema } from '#shared/schemas/source'
import { sourceCorrection } from '#server/services/equipment/corrections'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/**
 * The certificate correction at a set-point, interpolated linearly in the source's table;
 * 400 on `setPointK` outside the table (corrections are not extrapolated).
 */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'equipment:read')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const { setPointK } = await getValidatedQuery(event, parseWith(correctionQuerySchema))
  return await sourceCorrection(id, setPointK)
})
