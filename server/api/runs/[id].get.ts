import { idParamSchema } from '#shared/schemas/common'
import type { RunDetailDTO } from '#shared/types'
import { requirePermission } from '#server/utils/access'
import { runDetail } from '#server/services/runs/runs'
import { parseWith } from '#server/utils/validation'

/** A run: header, instrument, procedure version, points with results and budgets, revisions, audit. */
export default defineEventHandler(async (event): Promise<RunDetailDTO> => {
  await requirePermission(event, 'run:read')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  return await runDetail(id)
})
