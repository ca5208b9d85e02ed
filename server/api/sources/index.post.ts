import { sourceCreateSchema } from '#shared/schemas/source'
import { requirePermission } from '#server/utils/access'
import { SOURCE_REGISTER, createEquipment } from '#server/services/equipment/equipment'
import { parseWith } from '#server/utils/validation'

/** Register a blackbody source. Quality and admin manage reference equipment. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'equipment:edit')
  const input = await readValidatedBody(event, parseWith(sourceCreateSchema))
  const dto = await createEquipment(SOURCE_REGISTER, user, input)
  setResponseStatus(event, 201)
  return dto
})
