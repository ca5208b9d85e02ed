import { config } from '../utils/config'
import { migrate } from '../utils/migrate'
import { seedDemo } from '../utils/seed'

/**
 * At start: apply pending migrations, then, when BANDLIGHT_SEED=demo (set by
 * `npm run demo` and the test server), make sure the demo scenario is present.
 * Requests wait until this is done.
 */
export default defineNitroPlugin(async (nitroApp) => {
  const ready = (async () => {
    const applied = await migrate()
    if (applied.length) console.log(`[bandlight] migrations applied: ${applied.join(', ')}`)
    if (config().seed === 'demo') {
      const summary = await seedDemo()
      console.log(`[bandlight] demo data: ${summary}`)
    }
  })()
  ready.catch((err) => {
    console.error('[bandlight] database start-up failed', err)
    process.exit(1)
  })
  nitroApp.hooks.hook('request', async () => {
    await ready
  })
})
