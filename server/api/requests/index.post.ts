import { requestCreateSchema } from '#shared/schemas/request'
import { createRequest } from '#server/services/requests/requests'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** A customer asks for some of its instruments to be calibrated. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'request:create')
  const input = await readValidatedBody(event, parseWith(requestCreateSchema))
  const request = await createRequest(user, input)
  setResponseStatus(event, 201)
  return request
})
