import { Organization } from '../../../models/Organization'
import { requireRole } from '../../../utils/access'
import { organizationDTO } from '../../../utils/present'

export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin')
  const rows = await Organization.findAll({ order: [['name', 'ASC']] })
  return rows.map(organizationDTO)
})
