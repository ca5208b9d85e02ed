import { calibrationEquationSchema } from '#shared/schemas/calculation'
import { calibrationEquationOf } from '#server/services/calculations/calculations'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** A calibration equation through calibration points, with interpolated values and their uncertainty. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'calculation:run')
  return calibrationEquationOf(await readValidatedBody(event, parseWith(calibrationEquationSchema)))
})
