import { idParamSchema } from '../../../../../shared/schemas/common'
import { pointCreateSchema } from '../../../../../shared/schemas/run'
import { requireRole } from '../../../../utils/access'
import { addPointIn, pointDTOs } from '../../../../utils/runs'
import { inTransaction } from '../../../../utils/transaction'
import { parseWith } from '../../../../utils/validation'

/** Add a point: the source (and reference thermometer) must be usable on the calibration date; the result is computed and stored. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'technician', 'quality', 'admin')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(pointCreateSchema))
  const point = await inTransaction(t => addPointIn(t, user, id, input))
  setResponseStatus(event, 201)
  return (await pointDTOs([point]))[0]
})
