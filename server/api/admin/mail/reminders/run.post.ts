import { reminderRunSchema } from '#shared/schemas/mail'
import type { ReminderRunDTO } from '#shared/types'
import { requirePermission } from '#server/utils/access'
import { runDailyReminders } from '#server/services/reminders/reminders'
import { parseWith } from '#server/utils/validation'

/** "Run reminders now": the daily scan for today, whatever the hour, then one pass of the sender. */
export default defineEventHandler(async (event): Promise<ReminderRunDTO> => {
  await requirePermission(event, 'mail:manage')
  await readValidatedBody(event, parseWith(reminderRunSchema))
  const { run } = await runDailyReminders({ force: true })
  return run!
})
