import { LAB_ROLES } from '../../../shared/roles'
import { runQuerySchema } from '../../../shared/schemas/run'
import type { Page, RunDTO } from '../../../shared/types'
import { requireRole } from '../../utils/access'
import { listRuns } from '../../utils/runs'
import { parseWith } from '../../utils/validation'

/** Runs, paged; filters status, instrumentId, technicianId, q (instrument serial prefix); sorted. */
export default defineEventHandler(async (event): Promise<Page<RunDTO>> => {
  await requireRole(event, ...LAB_ROLES)
  const q = await getValidatedQuery(event, parseWith(runQuerySchema))
  return await listRuns(q)
})
