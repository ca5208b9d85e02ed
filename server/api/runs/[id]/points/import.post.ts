import { idParamSchema } from '../../../../../shared/schemas/common'
import { pointImportSchema } from '../../../../../shared/schemas/run'
import { requireRole } from '../../../../utils/access'
import { importPointsIn } from '../../../../utils/runs'
import { inTransaction } from '../../../../utils/transaction'
import { parseWith } from '../../../../utils/validation'

/** Points from CSV: a preview with errors by line and field, or (commit) every row or none. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'technician', 'quality', 'admin')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(pointImportSchema))
  const result = await inTransaction(t => importPointsIn(t, user, id, input))
  if ('created' in result) setResponseStatus(event, 201)
  return result
})
