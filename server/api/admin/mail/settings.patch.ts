import { mailSettingsUpdateSchema } from '#shared/schemas/mail'
import { updateMailSettings } from '#server/services/mail/settings'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Change when and how reminders go out (send hour, time zone, lead times, weekly overdue reminders). */
export default defineEventHandler(async (event) => {
  const admin = await requirePermission(event, 'mail:manage')
  const input = await readValidatedBody(event, parseWith(mailSettingsUpdateSchema))
  return await updateMailSettings(admin, input)
})
