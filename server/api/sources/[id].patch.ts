import { idParamSchema } from '#shared/schemas/common'
import { sourceUpdateSchema } from '#shared/schemas/source'
import { requirePermission } from '#server/utils/access'
import { SOURCE_REGISTER, updateEquipment } from '#server/services/equipment/equipment'
import { parseWith } from '#server/utils/validation'

/** Edit a blackbody source (409 when the version is stale; the merged record is re-checked). */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'equipment:edit')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(sourceUpdateSchema))
  return await updateEquipment(SOURCE_REGISTER, user, id, input)
})
