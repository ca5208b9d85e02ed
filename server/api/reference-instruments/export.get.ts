import { referenceQuerySchema } from '#shared/schemas/registerQuery'
import { requirePermission } from '#server/utils/access'
import { REFERENCE_REGISTER, exportEquipment } from '#server/services/equipment/equipment'
import { parseWith } from '#server/utils/validation'

/** CSV of the reference instruments matching the list's filters (all pages), formula cells escaped. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'equipment:read')
  const q = await getValidatedQuery(event, parseWith(referenceQuerySchema))
  return await exportEquipment(REFERENCE_REGISTER, event, q)
})
