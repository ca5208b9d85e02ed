import { requireRole } from '../../utils/access'

export default defineEventHandler(async (event) => {
  return await requireRole(event)
})
