import { userListQuerySchema } from '../../../../shared/schemas/user'
import { Organization } from '../../../models/Organization'
import { User } from '../../../models/User'
import { requireRole } from '../../../utils/access'
import { userDTO } from '../../../utils/present'
import { parseWith } from '../../../utils/validation'

/** All users (a lab has tens, not thousands: the table sorts and filters them in the page). */
export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin')
  const { includeInactive } = await getValidatedQuery(event, parseWith(userListQuerySchema))
  const users = await User.findAll({
    where: includeInactive ? {} : { active: true },
    include: [{ model: Organization, as: 'organization' }],
    order: [['name', 'ASC']],
  })
  return users.map(userDTO)
})
