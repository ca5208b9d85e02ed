import { idParamSchema } from '../../../shared/schemas/common'
import { runUpdateSchema } from '../../../shared/schemas/run'
import { requireRole } from '../../utils/access'
import { runDetail, updateRunIn } from '../../utils/runs'
import { inTransaction } from '../../utils/transaction'
import { parseWith } from '../../utils/validation'

/** Edit the run header (`version`; `reason` once submitted; 409 once approved); points are recomputed. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'technician', 'quality', 'admin')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(runUpdateSchema))
  await inTransaction(t => updateRunIn(t, user, id, input))
  return await runDetail(id)
})
