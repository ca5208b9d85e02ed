import { idParamSchema } from '../../../../shared/schemas/common'
import { runActionSchema } from '../../../../shared/schemas/run'
import { requireRole } from '../../../utils/access'
import { runDetail, submitRunIn } from '../../../utils/runs'
import { inTransaction } from '../../../utils/transaction'
import { parseWith } from '../../../utils/validation'

/** Submit a draft or returned run for review. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'technician', 'quality', 'admin')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(runActionSchema))
  await inTransaction(t => submitRunIn(t, user, id, input))
  return await runDetail(id)
})
