import { pointParamSchema, pointUpdateSchema } from '../../../../../shared/schemas/run'
import { requireRole } from '../../../../utils/access'
import { pointDTOs, updatePointIn } from '../../../../utils/runs'
import { inTransaction } from '../../../../utils/transaction'
import { parseWith } from '../../../../utils/validation'

/** Edit a point's observations (the point's `version`; `reason` once submitted); recomputed and stored. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'technician', 'quality', 'admin')
  const { id, pointId } = await getValidatedRouterParams(event, parseWith(pointParamSchema))
  const input = await readValidatedBody(event, parseWith(pointUpdateSchema))
  const point = await inTransaction(t => updatePointIn(t, user, id, pointId, input))
  return (await pointDTOs([point]))[0]
})
