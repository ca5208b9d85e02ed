import { nonconformityQuerySchema } from '#shared/schemas/nonconformity'
import { listNonconformities } from '#server/services/nonconformities/nonconformities'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Nonconformities, newest first, by status and the date raised. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'nonconformity:read')
  const q = await getValidatedQuery(event, parseWith(nonconformityQuerySchema))
  return await listNonconformities(q)
})
