import { idParamSchema } from '#shared/schemas/common'
import { passwordResetSchema } from '#shared/schemas/user'
import { resetUserPassword } from '#server/services/users/users'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Set a new password for a user (the admin hands it over; the hash is never audited); every session of theirs ends. */
export default defineEventHandler(async (event) => {
  const admin = await requirePermission(event, 'user:manage')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(passwordResetSchema))
  return await resetUserPassword(admin, id, input)
})
