import { LAB_ROLES } from '../../../shared/roles'
import { referenceQuerySchema } from '../../../shared/schemas/registerQuery'
import { requireRole } from '../../utils/access'
import { REFERENCE_REGISTER, exportEquipment } from '../../utils/registersEquipment'
import { parseWith } from '../../utils/validation'

/** CSV of the reference instruments matching the list's filters (all pages), formula cells escaped. */
export default defineEventHandler(async (event) => {
  await requireRole(event, ...LAB_ROLES)
  const q = await getValidatedQuery(event, parseWith(referenceQuerySchema))
  return await exportEquipment(REFERENCE_REGISTER, event, q)
})
