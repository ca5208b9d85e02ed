import { referenceCreateSchema } from '#shared/schemas/referenceInstrument'
import { requirePermission } from '#server/utils/access'
import { REFERENCE_REGISTER, createEquipment } from '#server/services/equipment/equipment'
import { parseWith } from '#server/utils/validation'

/** Register a reference instrument. Quality and admin manage reference equipment. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'equipment:edit')
  const input = await readValidatedBody(event, parseWith(referenceCreateSchema))
  const dto = await createEquipment(REFERENCE_REGISTER, user, input)
  setResponseStatus(event, 201)
  return dto
})
