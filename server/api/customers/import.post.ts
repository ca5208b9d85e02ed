import { csvImportSchema } from '../../../shared/schemas/registerQuery'
import { requireRole } from '../../utils/access'
import { importCustomers } from '../../utils/registersCustomers'
import { parseWith } from '../../utils/validation'

/** CSV import of customers (one contact per row): a preview, or with `commit` all rows or none. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'technician', 'quality', 'admin')
  const input = await readValidatedBody(event, parseWith(csvImportSchema))
  const result = await importCustomers(user, input)
  if ('created' in result) setResponseStatus(event, 201)
  return result
})
