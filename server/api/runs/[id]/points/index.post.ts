import { idParamSchema } from '#shared/schemas/common'
import { pointCreateSchema } from '#shared/schemas/run'
import { assertRunOpen, addPoint } from '#server/services/runs/runs'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Add a point: the source (and reference thermometer) must be usable on the calibration date; the result is computed and stored. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'run:edit')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  await assertRunOpen(id)
  const input = await readValidatedBody(event, parseWith(pointCreateSchema))
  const created = await addPoint(user, id, input)
  setResponseStatus(event, 201)
  return created
})
