import { idParamSchema } from '#shared/schemas/common'
import { runActionSchema } from '#shared/schemas/run'
import { submitRun } from '#server/services/runs/runs'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Submit a draft or returned run for review. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'run:edit')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(runActionSchema))
  return await submitRun(user, id, input)
})
