import { currentUser, toSessionUser } from '#server/services/auth/sessions'

/**
 * The pages learn who is signed in from nuxt-auth-utils' session route. Check the session record
 * there too, so a revoked session or a deactivated user shows as signed out at once, and a changed
 * name or role shows as it is now.
 */
export default defineNitroPlugin(() => {
  sessionHooks.hook('fetch', async (session, event) => {
    const user = await currentUser(event)
    if (!user) {
      await clearUserSession(event)
      throw createError({ statusCode: 401, statusMessage: 'Unauthorized', message: 'Sign in to continue' })
    }
    session.user = toSessionUser(user)
  })
})
