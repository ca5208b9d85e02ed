import { reminderPreviewQuerySchema } from '#shared/schemas/mail'
import type { ReminderPreviewDTO } from '#shared/types'
import { requirePermission } from '#server/utils/access'
import { previewReminders } from '#server/services/reminders/reminders'
import { parseWith } from '#server/utils/validation'

/** What the next run would send (today in the lab's time zone, or `?date=`). Writes nothing. */
export default defineEventHandler(async (event): Promise<ReminderPreviewDTO> => {
  await requirePermission(event, 'mail:manage')
  const q = await getValidatedQuery(event, parseWith(reminderPreviewQuerySchema))
  return previewReminders({ today: q.date })
})
