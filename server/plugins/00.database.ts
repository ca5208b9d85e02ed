import { migrate } from '#server/utils/migrate'

/**
 * At start: apply pending migrations. Requests wait until this is done. (Demo data is not part
 * of the server: `npm run db:seed` writes it.)
 */
export default defineNitroPlugin(async (nitroApp) => {
  const ready = (async () => {
    const applied = await migrate()
    if (applied.length) console.log(`[bandlight] migrations applied: ${applied.join(', ')}`)
  })()
  ready.catch((err) => {
    console.error('[bandlight] database start-up failed', err)
    process.exit(1)
  })
  nitroApp.hooks.hook('request', async () => {
    await ready
  })
})
