import { organizationCreateSchema } from '#shared/schemas/organization'
import { createOrganization } from '#server/services/organizations/organizations'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

export default defineEventHandler(async (event) => {
  const admin = await requirePermission(event, 'organization:manage')
  const input = await readValidatedBody(event, parseWith(organizationCreateSchema))
  const org = await createOrganization(admin, input)
  setResponseStatus(event, 201)
  return org
})
