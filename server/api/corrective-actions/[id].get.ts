import { idParamSchema } from '#shared/schemas/common'
import { correctiveActionDetail } from '#server/services/correctiveActions/correctiveActions'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

export default defineEventHandler(async (event) => {
  await requirePermission(event, 'action:read')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  return await correctiveActionDetail(id)
})
