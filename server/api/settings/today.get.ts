import { labTodayDTO } from '#server/services/settings/today'
import { requirePermission } from '#server/utils/access'

/** The laboratory's date today in its own time zone (form defaults use it). */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'account:self')
  return await labTodayDTO()
})
