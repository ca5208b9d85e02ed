import { referenceQuerySchema } from '#shared/schemas/registerQuery'
import { requirePermission } from '#server/utils/access'
import { REFERENCE_REGISTER, listEquipment } from '#server/services/equipment/equipment'
import { parseWith } from '#server/utils/validation'

/** The reference instruments, paged, sorted, filtered and searched on the server. Laboratory roles read. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'equipment:read')
  const q = await getValidatedQuery(event, parseWith(referenceQuerySchema))
  return await listEquipment(REFERENCE_REGISTER, q)
})
