import { LAB_ROLES } from '../../../shared/roles'
import { instrumentQuerySchema } from '../../../shared/schemas/registerQuery'
import { requireRole } from '../../utils/access'
import { exportInstruments } from '../../utils/registersInstruments'
import { parseWith } from '../../utils/validation'

/** CSV of the instruments matching the list's filters (all pages), formula cells escaped. */
export default defineEventHandler(async (event) => {
  await requireRole(event, ...LAB_ROLES)
  const q = await getValidatedQuery(event, parseWith(instrumentQuerySchema))
  return await exportInstruments(event, q)
})
