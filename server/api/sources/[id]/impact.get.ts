import { idParamSchema } from '#shared/schemas/common'
import { impactQuerySchema } from '#shared/schemas/impact'
import { impactOf } from '#server/services/impact/impact'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/**
 * Every run (not void) that used this source in a point (not voided) calibrated between `from` and
 * `to` (inclusive), and every valid certificate of those runs — an amended one by its latest valid
 * revision; withdrawn ones are left out. 404 for no such source.
 */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'impact:read')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const { from, to } = await getValidatedQuery(event, parseWith(impactQuerySchema))
  return await impactOf('source', id, from, to)
})
