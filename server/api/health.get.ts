import { sequelize } from '#server/utils/db'

/** Liveness with a real query. Open to anonymous callers. */
export default defineEventHandler(async (event) => {
  try {
    const [rows] = await sequelize.query('SELECT 1 AS ok')
    const ok = Array.isArray(rows) && (rows[0] as { ok?: number } | undefined)?.ok === 1
    if (!ok) throw new Error('unexpected answer')
    return { status: 'ok', db: 'ok' }
  }
  catch {
    setResponseStatus(event, 503)
    return { status: 'degraded', db: 'unavailable' }
  }
})
