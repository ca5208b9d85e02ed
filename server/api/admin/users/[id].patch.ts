import { idParamSchema } from '#shared/schemas/common'
import { userUpdateSchema } from '#shared/schemas/user'
import { updateUser } from '#server/services/users/users'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Edit name, role and organization. */
export default defineEventHandler(async (event) => {
  const admin = await requirePermission(event, 'user:manage')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(userUpdateSchema))
  return await updateUser(admin, id, input)
})
