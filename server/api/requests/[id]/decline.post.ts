import { idParamSchema } from '../../../../shared/schemas/common'
import { requestDeclineSchema } from '../../../../shared/schemas/request'
import { requireRole } from '../../../utils/access'
import { declineRequestIn, requestDTO } from '../../../utils/requests'
import { inTransaction } from '../../../utils/transaction'
import { parseWith } from '../../../utils/validation'

/** Decline a request with a message the customer reads. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'technician', 'quality', 'admin')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(requestDeclineSchema))
  const r = await inTransaction(t => declineRequestIn(t, user, id, input))
  return await requestDTO(r)
})
