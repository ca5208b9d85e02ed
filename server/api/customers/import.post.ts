import { csvImportSchema } from '#shared/schemas/registerQuery'
import { requirePermission } from '#server/utils/access'
import { importCustomers } from '#server/services/customers/customers'
import { parseWith } from '#server/utils/validation'

/** CSV import of customers (one contact per row): a preview, or with `commit` all rows or none. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'customer:edit')
  const input = await readValidatedBody(event, parseWith(csvImportSchema))
  const result = await importCustomers(user, input)
  if ('created' in result) setResponseStatus(event, 201)
  return result
})
