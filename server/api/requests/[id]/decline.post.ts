import { idParamSchema } from '#shared/schemas/common'
import { requestDeclineSchema } from '#shared/schemas/request'
import { declineRequest } from '#server/services/requests/requests'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Decline a request with a message the customer reads. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'request:handle')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(requestDeclineSchema))
  return await declineRequest(user, id, input)
})
