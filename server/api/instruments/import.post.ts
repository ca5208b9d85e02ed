import { csvImportSchema } from '#shared/schemas/registerQuery'
import { requirePermission } from '#server/utils/access'
import { importInstruments } from '#server/services/instruments/instruments'
import { parseWith } from '#server/utils/validation'

/** CSV import of instruments: a preview by row and field, or (commit) all rows in one transaction or none. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'instrument:edit')
  const input = await readValidatedBody(event, parseWith(csvImportSchema))
  const result = await importInstruments(user, input)
  if ('created' in result) setResponseStatus(event, 201)
  return result
})
