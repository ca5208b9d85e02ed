import { conformitySchema } from '#shared/schemas/calculation'
import { conformityOf } from '#server/services/calculations/calculations'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Conformity of an error with an accuracy specification under a decision rule (ILAC-G8). */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'calculation:run')
  return conformityOf(await readValidatedBody(event, parseWith(conformitySchema)))
})
