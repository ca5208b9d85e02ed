import { OPEN_API_PATHS } from '#shared/routeAccess'

/**
 * Every /api route needs a session, except the open ones (`open` in shared/routeAccess.ts).
 * Handlers still call requirePermission first: this is a second wall, not the only one.
 */
export default defineEventHandler(async (event) => {
  const path = event.path.split('?')[0]!.replace(/\/+$/, '')
  if (!path.startsWith('/api/') && path !== '/api') return
  if (OPEN_API_PATHS.includes(path)) return
  const session = await getUserSession(event)
  if (!session.user) {
    throw createError({ statusCode: 401, statusMessage: 'Unauthorized', message: 'Sign in to continue' })
  }
})
