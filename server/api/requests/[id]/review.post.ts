import { idParamSchema } from '#shared/schemas/common'
import { requestReviewSchema } from '#shared/schemas/request'
import { reviewRequest } from '#server/services/requests/requests'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** The laboratory's review of a request: the terms it offers, checked against its capability (ISO/IEC 17025 7.1). */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'request:handle')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(requestReviewSchema))
  return await reviewRequest(user, id, input)
})
