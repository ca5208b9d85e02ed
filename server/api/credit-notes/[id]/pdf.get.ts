import { idParamSchema } from '#shared/schemas/common'
import { creditNotePdfFile } from '#server/services/billing/invoices'
import { sendStoredFile } from '#server/services/uploads/uploads'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** A credit note's PDF exactly as issued. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'invoice:read')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  return sendStoredFile(event, await creditNotePdfFile(user, id))
})
