import { sourceCreateSchema } from '../../../shared/schemas/source'
import { requireRole } from '../../utils/access'
import { SOURCE_REGISTER, createEquipment } from '../../utils/registersEquipment'
import { parseWith } from '../../utils/validation'

/** Register a blackbody source. Quality and admin manage reference equipment. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'quality', 'admin')
  const input = await readValidatedBody(event, parseWith(sourceCreateSchema))
  const dto = await createEquipment(SOURCE_REGISTER, user, input)
  setResponseStatus(event, 201)
  return dto
})
