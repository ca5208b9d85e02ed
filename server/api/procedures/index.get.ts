import type { ProcedureDTO } from '#shared/types'
import { requirePermission } from '#server/utils/access'
import { listProcedures } from '#server/services/procedures/procedures'

/** Every procedure with its current version (decision rule, budget template, CMC). */
export default defineEventHandler(async (event): Promise<ProcedureDTO[]> => {
  await requirePermission(event, 'procedure:read')
  return await listProcedures()
})
