import { ratioReadingSchema } from '#shared/schemas/calculation'
import { ratioReadingOf } from '#server/services/calculations/calculations'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** What a ratio (two-colour) pyrometer should read on a source (two-colour model), with the sensitivity coefficients. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'calculation:run')
  return ratioReadingOf(await readValidatedBody(event, parseWith(ratioReadingSchema)))
})
