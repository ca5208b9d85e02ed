import { permissionForPath } from '#shared/navigation'
import { can } from '#shared/permissions'

// Convenience only: sends anonymous visitors to /login and keeps users off pages their role
// cannot use (the same permission policy the server applies in every API route).
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
  const permission = permissionForPath(to.path)
  if (permission && !can(user.value, permission)) {
    return abortNavigation(createError({ statusCode: 403, statusMessage: 'This page is not available to your role' }))
  }
})
