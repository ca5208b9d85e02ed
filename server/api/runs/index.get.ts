import { runQuerySchema } from '#shared/schemas/run'
import type { Page, RunDTO } from '#shared/types'
import { requirePermission } from '#server/utils/access'
import { listRuns } from '#server/services/runs/runs'
import { parseWith } from '#server/utils/validation'

/** Runs, paged; filters status, instrumentId, technicianId, q (instrument serial prefix); sorted. */
export default defineEventHandler(async (event): Promise<Page<RunDTO>> => {
  await requirePermission(event, 'run:read')
  const q = await getValidatedQuery(event, parseWith(runQuerySchema))
  return await listRuns(q)
})
