import { userCreateSchema } from '#shared/schemas/user'
import { createUser } from '#server/services/users/users'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

export default defineEventHandler(async (event) => {
  const admin = await requirePermission(event, 'user:manage')
  const input = await readValidatedBody(event, parseWith(userCreateSchema))
  const user = await createUser(admin, input)
  setResponseStatus(event, 201)
  return user
})
