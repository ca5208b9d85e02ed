import { idParamSchema } from '#shared/schemas/common'
import { impactQuerySchema } from '#shared/schemas/impact'
import { impactOf } from '#server/services/impact/impact'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** As GET /api/sources/[id]/impact, for a reference instrument (points that name it as their reference). */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'impact:read')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const { from, to } = await getValidatedQuery(event, parseWith(impactQuerySchema))
  return await impactOf('reference', id, from, to)
})
