import { idParamSchema } from '#shared/schemas/common'
import { invoicePdfFile } from '#server/services/billing/invoices'
import { sendStoredFile } from '#server/services/uploads/uploads'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** The invoice's PDF exactly as issued. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'invoice:read')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  return sendStoredFile(event, await invoicePdfFile(user, id))
})
