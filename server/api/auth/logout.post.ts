import { signOut } from '#server/services/auth/signIn'
import { requirePermission } from '#server/utils/access'

/** Sign out: this browser's session ends on the server, so its cookie is worthless from now on. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'account:self')
  return await signOut(event, user)
})
