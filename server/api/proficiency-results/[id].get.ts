import { idParamSchema } from '#shared/schemas/common'
import { proficiencyResultDetail } from '#server/services/proficiency/proficiency'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

export default defineEventHandler(async (event) => {
  await requirePermission(event, 'proficiency:read')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  return await proficiencyResultDetail(id)
})
