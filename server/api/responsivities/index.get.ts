import { responsivityQuerySchema } from '#shared/schemas/registerQuery'
import { listResponsivities } from '#server/services/responsivities/responsivities'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Responsivity tables by name, paged. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'responsivity:read')
  const q = await getValidatedQuery(event, parseWith(responsivityQuerySchema))
  return await listResponsivities(q)
})
