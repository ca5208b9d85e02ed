import { idParamSchema } from '#shared/schemas/common'
import { responsivityDetail } from '#server/services/responsivities/responsivities'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** One responsivity table with its points. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'responsivity:read')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  return await responsivityDetail(id)
})
