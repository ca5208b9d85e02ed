import { requestCreateSchema } from '../../../shared/schemas/request'
import { requireRole } from '../../utils/access'
import { createRequestIn, requestDTO } from '../../utils/requests'
import { inTransaction } from '../../utils/transaction'
import { parseWith } from '../../utils/validation'

/** A customer asks for some of its instruments to be calibrated. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'customer')
  const input = await readValidatedBody(event, parseWith(requestCreateSchema))
  const r = await inTransaction(t => createRequestIn(t, user, input))
  setResponseStatus(event, 201)
  return await requestDTO(r)
})
