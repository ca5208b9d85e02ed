import { sourceQuerySchema } from '#shared/schemas/registerQuery'
import { requirePermission } from '#server/utils/access'
import { SOURCE_REGISTER, listEquipment } from '#server/services/equipment/equipment'
import { parseWith } from '#server/utils/validation'

/** The blackbody sources, paged, sorted, filtered and searched on the server. Laboratory roles read. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'equipment:read')
  const q = await getValidatedQuery(event, parseWith(sourceQuerySchema))
  return await listEquipment(SOURCE_REGISTER, q)
})
