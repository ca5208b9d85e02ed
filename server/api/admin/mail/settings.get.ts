import { mailSettings } from '#server/services/mail/settings'
import { requirePermission } from '#server/utils/access'

/** When and how reminders go out. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'mail:manage')
  return await mailSettings()
})
