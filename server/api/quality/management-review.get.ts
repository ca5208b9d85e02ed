import { managementReviewQuerySchema } from '#shared/schemas/managementReview'
import { managementReview } from '#server/services/quality/overview'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** The management-review summary over a period (ISO/IEC 17025:2017 8.9): counts, lists, runs and certificates per month. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'quality:overview')
  const q = await getValidatedQuery(event, parseWith(managementReviewQuerySchema))
  return await managementReview(q)
})
