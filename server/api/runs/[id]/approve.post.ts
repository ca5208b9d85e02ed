import { idParamSchema } from '../../../../shared/schemas/common'
import { runActionSchema } from '../../../../shared/schemas/run'
import { requireRole } from '../../../utils/access'
import { approveRunIn, runDetail } from '../../../utils/runs'
import { inTransaction } from '../../../utils/transaction'
import { parseWith } from '../../../utils/validation'

/** Approve a submitted run; the person who performed it cannot (403). The run is then locked. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'quality')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(runActionSchema))
  await inTransaction(t => approveRunIn(t, user, id, input))
  return await runDetail(id)
})
