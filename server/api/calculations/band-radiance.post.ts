import { bandRadianceSchema } from '#shared/schemas/calculation'
import { bandRadianceOf } from '#server/services/calculations/calculations'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Band radiance of a blackbody, W·m⁻²·sr⁻¹, for a band in µm and a temperature in K (CODATA 2018 constants). */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'calculation:run')
  return bandRadianceOf(await readValidatedBody(event, parseWith(bandRadianceSchema)))
})
