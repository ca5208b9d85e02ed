import { idParamSchema } from '#shared/schemas/common'
import { intervalReviewQuerySchema } from '#shared/schemas/interval'
import { intervalReview } from '#server/services/intervals/intervals'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/**
 * The interval analysis of a customer's instrument from its approved runs' as-found points, for the
 * laboratory only: nothing is recorded, and no interval goes on its certificate unless agreed.
 */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'interval:read')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const q = await getValidatedQuery(event, parseWith(intervalReviewQuerySchema))
  return await intervalReview('instrument', id, q)
})
