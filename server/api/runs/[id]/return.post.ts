import { idParamSchema } from '#shared/schemas/common'
import { runReturnSchema } from '#shared/schemas/run'
import { returnRun } from '#server/services/runs/runs'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Return a submitted run to its technician with the reviewer's comments. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'run:review')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(runReturnSchema))
  return await returnRun(user, id, input)
})
