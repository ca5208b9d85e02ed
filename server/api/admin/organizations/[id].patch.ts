import { idParamSchema } from '#shared/schemas/common'
import { organizationUpdateSchema } from '#shared/schemas/organization'
import { updateOrganization } from '#server/services/organizations/organizations'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Edit name and contact addresses, deactivate or reactivate (never delete). */
export default defineEventHandler(async (event) => {
  const admin = await requirePermission(event, 'organization:manage')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(organizationUpdateSchema))
  return await updateOrganization(admin, id, input)
})
