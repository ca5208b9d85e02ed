import { invoiceQuerySchema } from '#shared/schemas/billing'
import { listInvoices } from '#server/services/billing/invoices'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Invoices (status `overdue`: open past their due date, oldest due first); a customer sees its organization's. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'invoice:read')
  const q = await getValidatedQuery(event, parseWith(invoiceQuerySchema))
  return listInvoices(user, q)
})
