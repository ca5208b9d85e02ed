import { config } from '#server/utils/config'
import { sendQueued } from '#server/services/mail/outbox'

/**
 * Delivers the outbox every MAIL_SEND_INTERVAL_MS (default 5000; 0 turns it off). Runs in every
 * server instance: the sender claims each row before sending it, so instances do not collide.
 * One pass at a time; a failed pass (SMTP down, database still migrating) is logged once per
 * distinct error and retried on the next tick.
 */
export default defineNitroPlugin((nitroApp) => {
  const interval = config().mail.sendIntervalMs
  if (interval <= 0) return
  let busy = false
  let lastError = ''
  const timer = setInterval(async () => {
    if (busy) return
    busy = true
    try {
      await sendQueued()
      lastError = ''
    }
    catch (err) {
      const message = String((err as Error)?.message ?? err)
      if (message !== lastError) console.error('[bandlight] mail sender:', message)
      lastError = message
    }
    finally {
      busy = false
    }
  }, Math.max(100, interval))
  timer.unref()
  nitroApp.hooks.hook('close', () => clearInterval(timer))
})
