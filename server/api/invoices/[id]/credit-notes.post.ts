import { creditNoteManualSchema } from '#shared/schemas/billing'
import { idParamSchema } from '#shared/schemas/common'
import { creditByHand } from '#server/services/billing/invoices'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** A credit note against an invoice, by hand, line by line. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'billing:manage')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(creditNoteManualSchema))
  setResponseStatus(event, 201)
  return creditByHand(user, id, input)
})
