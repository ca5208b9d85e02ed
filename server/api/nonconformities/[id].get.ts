import { idParamSchema } from '#shared/schemas/common'
import { nonconformityDetail } from '#server/services/nonconformities/nonconformities'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** A nonconformity with its affected work (now, and when raised) and the effect at each point, decisions, corrective actions and audit trail. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'nonconformity:read')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  return await nonconformityDetail(id)
})
