import { billingExportQuerySchema } from '#shared/schemas/billing'
import { accountingCsv } from '#server/services/billing/export'
import { requirePermission } from '#server/utils/access'
import { sendCsv } from '#server/utils/csv'
import { parseWith } from '#server/utils/validation'

/** Invoices, credit notes and payments of a period as CSV, for the accounts. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'billing:manage')
  const q = await getValidatedQuery(event, parseWith(billingExportQuerySchema))
  return sendCsv(event, `accounting-${q.from}-to-${q.to}`, await accountingCsv(q))
})
