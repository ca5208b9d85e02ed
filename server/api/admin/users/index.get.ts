import { userListQuerySchema } from '#shared/schemas/user'
import { listUsers } from '#server/services/users/users'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** All users (a lab has tens, not thousands: the table sorts and filters them in the page). */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'user:manage')
  const { includeInactive } = await getValidatedQuery(event, parseWith(userListQuerySchema))
  return await listUsers(includeInactive)
})
