import { LAB_ROLES } from '../../../shared/roles'
import { readingSensitivities } from '../../../shared/radiometry/reading'
import { expectedReadingSchema } from '../../../shared/schemas/calculation'
import { requireRole } from '../../utils/access'
import { engine } from '../../utils/engine'
import { parseWith } from '../../utils/validation'

/**
 * What an instrument with emissivity setting ε_i and internal temperature T_d should read on a
 * source of emissivity ε_s at T_s with reflected temperature T_w, and ∂T_meas/∂x for each input.
 */
export default defineEventHandler(async (event) => {
  await requireRole(event, ...LAB_ROLES)
  const input = await readValidatedBody(event, parseWith(expectedReadingSchema))
  const { expectedReadingK, ...sensitivities } = engine(() => readingSensitivities(input), 'sourceTemperatureK')
  return { expectedReadingK, sensitivities }
})
