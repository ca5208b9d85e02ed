import { reminderPreviewQuerySchema } from '../../../../../shared/schemas/mail'
import type { ReminderPreviewDTO } from '../../../../../shared/types'
import { requireRole } from '../../../../utils/access'
import { previewReminders } from '../../../../utils/reminders'
import { parseWith } from '../../../../utils/validation'

/** What the next run would send (today in the lab's time zone, or `?date=`). Writes nothing. */
export default defineEventHandler(async (event): Promise<ReminderPreviewDTO> => {
  await requireRole(event, 'admin')
  const q = await getValidatedQuery(event, parseWith(reminderPreviewQuerySchema))
  return previewReminders({ today: q.date })
})
