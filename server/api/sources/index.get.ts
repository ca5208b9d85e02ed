import { LAB_ROLES } from '../../../shared/roles'
import { sourceQuerySchema } from '../../../shared/schemas/registerQuery'
import { requireRole } from '../../utils/access'
import { SOURCE_REGISTER, listEquipment } from '../../utils/registersEquipment'
import { parseWith } from '../../utils/validation'

/** The blackbody sources, paged, sorted, filtered and searched on the server. Laboratory roles read. */
export default defineEventHandler(async (event) => {
  await requireRole(event, ...LAB_ROLES)
  const q = await getValidatedQuery(event, parseWith(sourceQuerySchema))
  return await listEquipment(SOURCE_REGISTER, q)
})
