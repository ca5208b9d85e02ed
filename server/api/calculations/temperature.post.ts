import { LAB_ROLES } from '../../../shared/roles'
import { temperatureFromRadiance } from '../../../shared/radiometry/inversion'
import { temperatureSchema } from '../../../shared/schemas/calculation'
import { requireRole } from '../../utils/access'
import { engine } from '../../utils/engine'
import { parseWith } from '../../utils/validation'

/** Blackbody temperature, K, whose band radiance is the given one (inverse of band-radiance). */
export default defineEventHandler(async (event) => {
  await requireRole(event, ...LAB_ROLES)
  const { band, radiance } = await readValidatedBody(event, parseWith(temperatureSchema))
  return { temperatureK: engine(() => temperatureFromRadiance(band, radiance), 'radiance') }
})
