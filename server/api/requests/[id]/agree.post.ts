import { idParamSchema } from '#shared/schemas/common'
import { requestAgreeSchema } from '#shared/schemas/request'
import { agreeRequest } from '#server/services/requests/requests'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** The customer agrees, in the portal, to the terms the laboratory offered (naming the terms' version). */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'request:agree')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(requestAgreeSchema))
  return await agreeRequest(user, id, input)
})
