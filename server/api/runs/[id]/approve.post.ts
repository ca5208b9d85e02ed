import { idParamSchema } from '#shared/schemas/common'
import { runActionSchema } from '#shared/schemas/run'
import { approveRun } from '#server/services/runs/runs'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Approve a submitted run; the person who performed it cannot (403). The run is then locked. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'run:review')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(runActionSchema))
  return await approveRun(user, id, input)
})
