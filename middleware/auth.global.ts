import { rolesForPath } from '~~/shared/navigation'

// Convenience only: sends anonymous visitors to /login and keeps roles off pages they
// cannot use. The server checks the session and role in every API route regardless.
const PUBLIC_PAGES = ['/login', '/verify']

export default defineNuxtRouteMiddleware((to) => {
  const { loggedIn, user } = useUserSession()
  if (PUBLIC_PAGES.includes(to.path)) {
    if (loggedIn.value && to.path === '/login') return navigateTo('/')
    return
  }
  if (!loggedIn.value || !user.value) {
    return navigateTo({ path: '/login', query: to.fullPath !== '/' ? { next: to.fullPath } : {} })
  }
  const roles = rolesForPath(to.path)
  if (roles && !roles.includes(user.value.role)) {
    return abortNavigation(createError({ statusCode: 403, statusMessage: 'This page is not available to your role' }))
  }
})
