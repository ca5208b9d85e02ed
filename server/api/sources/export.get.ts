import { sourceQuerySchema } from '#shared/schemas/registerQuery'
import { requirePermission } from '#server/utils/access'
import { SOURCE_REGISTER, exportEquipment } from '#server/services/equipment/equipment'
import { parseWith } from '#server/utils/validation'

/** CSV of the blackbody sources matching the list's filters (all pages), formula cells escaped. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'equipment:read')
  const q = await getValidatedQuery(event, parseWith(sourceQuerySchema))
  return await exportEquipment(SOURCE_REGISTER, event, q)
})
