import { idParamSchema } from '#shared/schemas/common'
import { runUpdateSchema } from '#shared/schemas/run'
import { assertRunOpen, updateRun } from '#server/services/runs/runs'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Edit the run header (`version`; `reason` once submitted; 409 once approved); points are recomputed. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'run:edit')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  await assertRunOpen(id)
  const input = await readValidatedBody(event, parseWith(runUpdateSchema))
  return await updateRun(user, id, input)
})
