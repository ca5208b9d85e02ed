import { csvImportSchema } from '../../../shared/schemas/registerQuery'
import { requireRole } from '../../utils/access'
import { importInstruments } from '../../utils/registersInstruments'
import { parseWith } from '../../utils/validation'

/** CSV import of instruments: a preview by row and field, or (commit) all rows in one transaction or none. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'technician', 'quality', 'admin')
  const input = await readValidatedBody(event, parseWith(csvImportSchema))
  const result = await importInstruments(user, input)
  if ('created' in result) setResponseStatus(event, 201)
  return result
})
