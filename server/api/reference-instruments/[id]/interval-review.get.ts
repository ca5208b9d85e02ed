import { idParamSchema } from '#shared/schemas/common'
import { intervalReviewQuerySchema } from '#shared/schemas/interval'
import { intervalReview } from '#server/services/intervals/intervals'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** The interval analysis from the as-found history (staircase and drift), with the laboratory's settings and past decisions. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'interval:read')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const q = await getValidatedQuery(event, parseWith(intervalReviewQuerySchema))
  return await intervalReview('reference', id, q)
})
