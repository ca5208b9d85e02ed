import { nonconformityCreateSchema } from '#shared/schemas/nonconformity'
import { raiseNonconformity } from '#server/services/nonconformities/nonconformities'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Raise a nonconformity by hand (with its affected item and period, when there is one). */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'nonconformity:raise')
  const input = await readValidatedBody(event, parseWith(nonconformityCreateSchema))
  const nc = await raiseNonconformity(user, input)
  setResponseStatus(event, 201)
  return nc
})
