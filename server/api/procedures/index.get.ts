import { LAB_ROLES } from '../../../shared/roles'
import type { ProcedureDTO } from '../../../shared/types'
import { requireRole } from '../../utils/access'
import { listProcedures } from '../../utils/procedures'

/** Every procedure with its current version (decision rule, budget template, CMC). */
export default defineEventHandler(async (event): Promise<ProcedureDTO[]> => {
  await requireRole(event, ...LAB_ROLES)
  return await listProcedures()
})
