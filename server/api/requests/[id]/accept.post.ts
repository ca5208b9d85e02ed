import { idParamSchema } from '#shared/schemas/common'
import { requestAcceptSchema } from '#shared/schemas/request'
import { acceptRequest } from '#server/services/requests/requests'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Accept a request: a draft run is opened for each instrument, performed by the caller. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'request:handle')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(requestAcceptSchema))
  return await acceptRequest(user, id, input)
})
