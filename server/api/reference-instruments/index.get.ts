import { LAB_ROLES } from '../../../shared/roles'
import { referenceQuerySchema } from '../../../shared/schemas/registerQuery'
import { requireRole } from '../../utils/access'
import { REFERENCE_REGISTER, listEquipment } from '../../utils/registersEquipment'
import { parseWith } from '../../utils/validation'

/** The reference instruments, paged, sorted, filtered and searched on the server. Laboratory roles read. */
export default defineEventHandler(async (event) => {
  await requireRole(event, ...LAB_ROLES)
  const q = await getValidatedQuery(event, parseWith(referenceQuerySchema))
  return await listEquipment(REFERENCE_REGISTER, q)
})
