import { idParamSchema } from '../../../shared/schemas/common'
import { procedureUpdateSchema } from '../../../shared/schemas/procedure'
import { requireRole } from '../../utils/access'
import { procedureDetail, updateProcedureIn } from '../../utils/procedures'
import { inTransaction } from '../../utils/transaction'
import { parseWith } from '../../utils/validation'

/** Edit a procedure: writes a new version (runs keep theirs); 409 when `version` is stale. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'quality', 'admin')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(procedureUpdateSchema))
  await inTransaction(t => updateProcedureIn(t, user.id, id, input))
  return await procedureDetail(id)
})
