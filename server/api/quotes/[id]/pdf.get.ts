import { idParamSchema } from '#shared/schemas/common'
import { quotePdfFile } from '#server/services/billing/quotes'
import { sendStoredFile } from '#server/services/uploads/uploads'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** The quote's PDF as it was sent. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'quote:read')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  return sendStoredFile(event, await quotePdfFile(user, id))
})
