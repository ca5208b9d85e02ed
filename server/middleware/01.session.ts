import { isOpenApiRoute } from '../utils/openRoutes'

/**
 * Every /api route needs a session, except the open ones. Handlers still call
 * requireRole first: this is a second wall, not the only one.
 */
export default defineEventHandler(async (event) => {
  const path = event.path
  if (!path.startsWith('/api/') && path !== '/api') return
  if (isOpenApiRoute(path)) return
  const session = await getUserSession(event)
  if (!session.user) {
    throw createError({ statusCode: 401, statusMessage: 'Unauthorized', message: 'Sign in to continue' })
  }
})
