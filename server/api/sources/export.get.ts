import { LAB_ROLES } from '../../../shared/roles'
import { sourceQuerySchema } from '../../../shared/schemas/registerQuery'
import { requireRole } from '../../utils/access'
import { SOURCE_REGISTER, exportEquipment } from '../../utils/registersEquipment'
import { parseWith } from '../../utils/validation'

/** CSV of the blackbody sources matching the list's filters (all pages), formula cells escaped. */
export default defineEventHandler(async (event) => {
  await requireRole(event, ...LAB_ROLES)
  const q = await getValidatedQuery(event, parseWith(sourceQuerySchema))
  return await exportEquipment(SOURCE_REGISTER, event, q)
})
