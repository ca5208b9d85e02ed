import { pointParamSchema, pointUpdateSchema } from '#shared/schemas/run'
import { assertRunOpen, updatePoint } from '#server/services/runs/runs'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Edit a point's observations (the point's `version`; `reason` once submitted); recomputed and stored. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'run:edit')
  const { id, pointId } = await getValidatedRouterParams(event, parseWith(pointParamSchema))
  await assertRunOpen(id)
  const input = await readValidatedBody(event, parseWith(pointUpdateSchema))
  return await updatePoint(user, id, pointId, input)
})
