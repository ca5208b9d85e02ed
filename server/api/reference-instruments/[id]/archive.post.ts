import { idParamSchema } from '#shared/schemas/common'
import { archiveSchema } from '#shared/schemas/registerQuery'
import { requirePermission } from '#server/utils/access'
import { REFERENCE_REGISTER, archiveEquipment } from '#server/services/equipment/equipment'
import { parseWith } from '#server/utils/validation'

/** Archive or restore a reference instrument; records are never deleted. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'equipment:edit')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(archiveSchema))
  return await archiveEquipment(REFERENCE_REGISTER, user, id, input)
})
