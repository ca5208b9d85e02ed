import { LAB_ROLES } from '../../../shared/roles'
import { idParamSchema } from '../../../shared/schemas/common'
import type { RunDetailDTO } from '../../../shared/types'
import { requireRole } from '../../utils/access'
import { runDetail } from '../../utils/runs'
import { parseWith } from '../../utils/validation'

/** A run: header, instrument, procedure version, points with results and budgets, revisions, audit. */
export default defineEventHandler(async (event): Promise<RunDetailDTO> => {
  await requireRole(event, ...LAB_ROLES)
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  return await runDetail(id)
})
