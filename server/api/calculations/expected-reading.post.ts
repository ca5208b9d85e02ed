import { expectedReadingSchema } from '#shared/schemas/calculation'
import { expectedReadingOf } from '#server/services/calculations/calculations'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** What an instrument should read on a source (reading model), with the sensitivity coefficients. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'calculation:run')
  return expectedReadingOf(await readValidatedBody(event, parseWith(expectedReadingSchema)))
})
