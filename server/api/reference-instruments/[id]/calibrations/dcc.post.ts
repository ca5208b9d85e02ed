import { calibrationDccFieldsSchema } from '#shared/schemas/calibration'
import { idParamSchema } from '#shared/schemas/common'
import { requirePermission } from '#server/utils/access'
import { readFileFormWith } from '#server/utils/multipart'
import { importCalibrationDcc } from '#server/services/equipment/dccImport'
import { REFERENCE_REGISTER } from '#server/services/equipment/equipment'
import { parseWith } from '#server/utils/validation'

/**
 * A supplier's DCC (multipart: `file`) as a calibration of a reference instrument: without `commit=true`
 * the values it would record (200, preview); with `commit=true` and `dueDate` the calibration
 * recorded with those values and the file kept (201).
 */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'equipment:edit')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const form = await readFileFormWith(event, calibrationDccFieldsSchema)
  const result = await importCalibrationDcc(REFERENCE_REGISTER, user, id, form)
  if (result.committed) setResponseStatus(event, 201)
  return result
})
