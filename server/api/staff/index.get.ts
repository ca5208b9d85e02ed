import { listStaff } from '#server/services/users/users'
import { requirePermission } from '#server/utils/access'

/** The laboratory's active staff who perform runs (names and roles), for assigning work. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'run:read')
  return await listStaff()
})
