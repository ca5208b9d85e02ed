import { calibrationCreateSchema } from '#shared/schemas/calibration'
import { idParamSchema } from '#shared/schemas/common'
import { requirePermission } from '#server/utils/access'
import { REFERENCE_REGISTER, addCalibration } from '#server/services/equipment/equipment'
import { parseWith } from '#server/utils/validation'

/** Record an external calibration of a reference instrument (its certificate, optionally as an upload). */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'equipment:edit')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(calibrationCreateSchema))
  const dto = await addCalibration(REFERENCE_REGISTER, user, id, input)
  setResponseStatus(event, 201)
  return dto
})
