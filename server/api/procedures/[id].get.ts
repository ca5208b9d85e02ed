import { LAB_ROLES } from '../../../shared/roles'
import { idParamSchema } from '../../../shared/schemas/common'
import type { ProcedureDetailDTO } from '../../../shared/types'
import { requireRole } from '../../utils/access'
import { procedureDetail } from '../../utils/procedures'
import { parseWith } from '../../utils/validation'

/** One procedure with all its versions (newest first) and its audit trail. */
export default defineEventHandler(async (event): Promise<ProcedureDetailDTO> => {
  await requireRole(event, ...LAB_ROLES)
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  return await procedureDetail(id)
})
