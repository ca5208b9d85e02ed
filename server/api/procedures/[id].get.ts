import { idParamSchema } from '#shared/schemas/common'
import type { ProcedureDetailDTO } from '#shared/types'
import { requirePermission } from '#server/utils/access'
import { procedureDetail } from '#server/services/procedures/procedures'
import { parseWith } from '#server/utils/validation'

/** One procedure with all its versions (newest first) and its audit trail. */
export default defineEventHandler(async (event): Promise<ProcedureDetailDTO> => {
  await requirePermission(event, 'procedure:read')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  return await procedureDetail(id)
})
