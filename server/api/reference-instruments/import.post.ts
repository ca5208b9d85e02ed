import { csvImportSchema } from '#shared/schemas/registerQuery'
import { requirePermission } from '#server/utils/access'
import { REFERENCE_REGISTER, importEquipment } from '#server/services/equipment/equipment'
import { parseWith } from '#server/utils/validation'

/** CSV import of reference instruments: a preview by row and field, or (commit) all rows in one transaction or none. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'equipment:edit')
  const input = await readValidatedBody(event, parseWith(csvImportSchema))
  const result = await importEquipment(REFERENCE_REGISTER, user, input)
  if ('created' in result) setResponseStatus(event, 201)
  return result
})
