import { instrumentQuerySchema } from '#shared/schemas/registerQuery'
import { listInstruments } from '#server/services/instruments/instruments'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/**
 * Instruments, paged, sorted, filtered and searched on the server. A customer sees only its own
 * organization's instruments, whatever organizationId it asks for.
 */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'instrument:read')
  const q = await getValidatedQuery(event, parseWith(instrumentQuerySchema))
  return await listInstruments(user, q)
})
