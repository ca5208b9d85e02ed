import { referenceCreateSchema } from '../../../shared/schemas/referenceInstrument'
import { requireRole } from '../../utils/access'
import { REFERENCE_REGISTER, createEquipment } from '../../utils/registersEquipment'
import { parseWith } from '../../utils/validation'

/** Register a reference instrument. Quality and admin manage reference equipment. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'quality', 'admin')
  const input = await readValidatedBody(event, parseWith(referenceCreateSchema))
  const dto = await createEquipment(REFERENCE_REGISTER, user, input)
  setResponseStatus(event, 201)
  return dto
})
