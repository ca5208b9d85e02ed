import { OPEN_API_PATHS } from '#shared/routeAccess'
import { hasSessionCookie } from '#server/services/auth/sessions'

/**
 * Every /api route needs a session, except the open ones (`open` in shared/routeAccess.ts).
 * Handlers still call requirePermission first: this is a second wall, not the only one.
 */
export default defineEventHandler(async (event) => {
  const path = event.path.split('?')[0]!.replace(/\/+$/, '')
  if (!path.startsWith('/api/') && path !== '/api') return
  if (OPEN_API_PATHS.includes(path)) return
  if (!(await hasSessionCookie(event))) {
    throw createError({ statusCode: 401, statusMessage: 'Unauthorized', message: 'Sign in to continue' })
  }
})
