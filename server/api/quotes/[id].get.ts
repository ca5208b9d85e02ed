import { idParamSchema } from '#shared/schemas/common'
import { quoteDetail } from '#server/services/billing/quotes'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'quote:read')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  return quoteDetail(user, id)
})
