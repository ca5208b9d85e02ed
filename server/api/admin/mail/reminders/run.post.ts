import { reminderRunSchema } from '../../../../../shared/schemas/mail'
import type { ReminderRunDTO } from '../../../../../shared/types'
import { requireRole } from '../../../../utils/access'
import { runDailyReminders } from '../../../../utils/reminders'
import { parseWith } from '../../../../utils/validation'

/** "Run reminders now": the daily scan for today, whatever the hour, then one pass of the sender. */
export default defineEventHandler(async (event): Promise<ReminderRunDTO> => {
  await requireRole(event, 'admin')
  await readValidatedBody(event, parseWith(reminderRunSchema))
  const { run } = await runDailyReminders({ force: true })
  return run!
})
