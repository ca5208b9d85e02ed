import { idParamSchema } from '#shared/schemas/common'
import { pointImportSchema } from '#shared/schemas/run'
import { assertRunOpen, importPoints } from '#server/services/runs/runs'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Points from CSV: a preview with errors by line and field, or (commit) every row or none. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'run:edit')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  await assertRunOpen(id)
  const input = await readValidatedBody(event, parseWith(pointImportSchema))
  const result = await importPoints(user, id, input)
  if ('created' in result) setResponseStatus(event, 201)
  return result
})
