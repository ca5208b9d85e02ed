import { idParamSchema } from '../../../../shared/schemas/common'
import { runReturnSchema } from '../../../../shared/schemas/run'
import { requireRole } from '../../../utils/access'
import { returnRunIn, runDetail } from '../../../utils/runs'
import { inTransaction } from '../../../utils/transaction'
import { parseWith } from '../../../utils/validation'

/** Return a submitted run to its technician with the reviewer's comments. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'quality')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(runReturnSchema))
  await inTransaction(t => returnRunIn(t, user, id, input))
  return await runDetail(id)
})
