import { temperatureSchema } from '#shared/schemas/calculation'
import { temperatureOf } from '#server/services/calculations/calculations'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Inversion: the blackbody temperature, K, whose band radiance in the band is the given one. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'calculation:run')
  return temperatureOf(await readValidatedBody(event, parseWith(temperatureSchema)))
})
