import { LAB_ROLES } from '../../../shared/roles'
import { bandRadiance } from '../../../shared/radiometry/planck'
import { bandRadianceSchema } from '../../../shared/schemas/calculation'
import { requireRole } from '../../utils/access'
import { engine } from '../../utils/engine'
import { parseWith } from '../../utils/validation'

/** Band radiance of a blackbody, W·m⁻²·sr⁻¹, for a band in µm and a temperature in K (CODATA 2018 constants). */
export default defineEventHandler(async (event) => {
  await requireRole(event, ...LAB_ROLES)
  const { band, temperatureK } = await readValidatedBody(event, parseWith(bandRadianceSchema))
  return { radiance: engine(() => bandRadiance(band, temperatureK), 'temperatureK') }
})
