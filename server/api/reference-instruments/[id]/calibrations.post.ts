import { calibrationCreateSchema } from '../../../../shared/schemas/calibration'
import { idParamSchema } from '../../../../shared/schemas/common'
import { requireRole } from '../../../utils/access'
import { REFERENCE_REGISTER, addCalibration } from '../../../utils/registersEquipment'
import { parseWith } from '../../../utils/validation'

/** Record an external calibration of a reference instrument (its certificate, optionally as an upload). */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'quality', 'admin')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(calibrationCreateSchema))
  const dto = await addCalibration(REFERENCE_REGISTER, user, id, input)
  setResponseStatus(event, 201)
  return dto
})
