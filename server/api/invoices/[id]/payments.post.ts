import { paymentRecordSchema } from '#shared/schemas/billing'
import { idParamSchema } from '#shared/schemas/common'
import { recordBankTransfer } from '#server/services/billing/invoices'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Record a bank transfer received for an invoice. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'billing:manage')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(paymentRecordSchema))
  setResponseStatus(event, 201)
  return recordBankTransfer(user, id, input)
})
