import { idParamSchema } from '../../../../shared/schemas/common'
import { requestAcceptSchema } from '../../../../shared/schemas/request'
import { requireRole } from '../../../utils/access'
import { acceptRequestIn, requestDTO } from '../../../utils/requests'
import { inTransaction } from '../../../utils/transaction'
import { parseWith } from '../../../utils/validation'

/** Accept a request: a draft run is opened for each instrument, performed by the caller. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'technician', 'quality', 'admin')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(requestAcceptSchema))
  const r = await inTransaction(t => acceptRequestIn(t, user, id, input))
  return await requestDTO(r)
})
