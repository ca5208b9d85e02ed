import { pointParamSchema, voidSchema } from '#shared/schemas/run'
import { assertRunOpen, voidPoint } from '#server/services/runs/runs'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Void a mistaken point with the reason: kept (greyed, audited), never used or printed. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'run:edit')
  const { id, pointId } = await getValidatedRouterParams(event, parseWith(pointParamSchema))
  await assertRunOpen(id)
  const input = await readValidatedBody(event, parseWith(voidSchema))
  return await voidPoint(user, id, pointId, input)
})
