import { requirePermission } from '#server/utils/access'

export default defineEventHandler(async (event) => {
  return await requirePermission(event, 'account:self')
})
