import { pruneHits } from '#server/utils/rateLimit'
import { runDailyReminders } from '#server/services/reminders/reminders'

/**
 * Recalibration reminders, reference-equipment alerts and overdue corrective actions. Scheduled hourly (nuxt.config.ts);
 * does its work from the configured send hour in the lab's time zone on, and is idempotent, so
 * the later hours of the day, and other server instances, send nothing twice.
 */
export default defineTask({
  meta: {
    name: 'reminders:daily',
    description: 'Queue due recalibration reminders, equipment alerts and overdue corrective actions, then send the outbox',
  },
  async run() {
    await pruneHits()
    const result = await runDailyReminders()
    if (result.ran && result.run && (result.run.queued || result.run.skipped)) {
      console.log(`[bandlight] reminders ${result.run.today}: ${result.run.queued} queued, ${result.run.logged} milestones, ${result.run.skipped} skipped`)
    }
    return { result }
  },
})
