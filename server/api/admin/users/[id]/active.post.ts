import { idParamSchema } from '#shared/schemas/common'
import { activeFlagSchema } from '#shared/schemas/user'
import { setUserActive } from '#server/services/users/users'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Deactivate (or reactivate) a user; deactivation ends every session of theirs. Users are never deleted. */
export default defineEventHandler(async (event) => {
  const admin = await requirePermission(event, 'user:manage')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const { active } = await readValidatedBody(event, parseWith(activeFlagSchema))
  return await setUserActive(admin, id, active)
})
