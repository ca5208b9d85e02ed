import { complaintQuerySchema } from '#shared/schemas/complaint'
import { listComplaints } from '#server/services/complaints/complaints'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Complaints, newest first; a customer sees only its organization's. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'complaint:read')
  const q = await getValidatedQuery(event, parseWith(complaintQuerySchema))
  return await listComplaints(user, q)
})
