import { instrumentQuerySchema } from '#shared/schemas/registerQuery'
import { requirePermission } from '#server/utils/access'
import { exportInstruments } from '#server/services/instruments/instruments'
import { parseWith } from '#server/utils/validation'

/** CSV of the instruments matching the list's filters (all pages), formula cells escaped. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'instrument:export')
  const q = await getValidatedQuery(event, parseWith(instrumentQuerySchema))
  return await exportInstruments(event, q)
})
