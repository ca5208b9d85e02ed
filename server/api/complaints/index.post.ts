import { complaintCreateSchema } from '#shared/schemas/complaint'
import { submitComplaint } from '#server/services/complaints/complaints'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/**
 * A complaint: a customer's in the portal (about its own organization's certificate or instrument;
 * another's is 404), or one the laboratory received otherwise. The acknowledgement is mailed.
 */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'complaint:submit')
  const input = await readValidatedBody(event, parseWith(complaintCreateSchema))
  const complaint = await submitComplaint(user, input)
  setResponseStatus(event, 201)
  return complaint
})
