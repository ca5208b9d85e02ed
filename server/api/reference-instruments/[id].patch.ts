import { idParamSchema } from '#shared/schemas/common'
import { referenceUpdateSchema } from '#shared/schemas/referenceInstrument'
import { requirePermission } from '#server/utils/access'
import { REFERENCE_REGISTER, updateEquipment } from '#server/services/equipment/equipment'
import { parseWith } from '#server/utils/validation'

/** Edit a reference instrument (409 when the version is stale; the merged record is re-checked). */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'equipment:edit')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(referenceUpdateSchema))
  return await updateEquipment(REFERENCE_REGISTER, user, id, input)
})
