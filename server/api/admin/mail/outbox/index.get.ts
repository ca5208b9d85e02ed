import { outboxQuerySchema } from '#shared/schemas/mail'
import { listOutbox } from '#server/services/mail/outbox'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** The outbox, newest first, paged; filter by status or kind. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'mail:manage')
  const q = await getValidatedQuery(event, parseWith(outboxQuerySchema))
  return await listOutbox(q)
})
