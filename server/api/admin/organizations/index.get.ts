import { listOrganizations } from '#server/services/organizations/organizations'
import { requirePermission } from '#server/utils/access'

export default defineEventHandler(async (event) => {
  await requirePermission(event, 'organization:manage')
  return await listOrganizations()
})
