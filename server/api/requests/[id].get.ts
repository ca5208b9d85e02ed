import { idParamSchema } from '#shared/schemas/common'
import { requestDetail } from '#server/services/requests/requests'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** One calibration request (a customer only its own organization's). */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'request:read')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  return await requestDetail(user, id)
})
