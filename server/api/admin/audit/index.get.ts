import { auditQuerySchema } from '#shared/schemas/audit'
import { listAudit } from '#server/services/audit/audit'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Browse the audit trail, newest first, filtered and paged on the server. Read-only. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'audit:read')
  const q = await getValidatedQuery(event, parseWith(auditQuerySchema))
  return await listAudit(q)
})
