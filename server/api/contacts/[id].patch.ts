import { idParamSchema } from '#shared/schemas/common'
import { contactUpdateSchema } from '#shared/schemas/customer'
import { updateContact } from '#server/services/customers/customers'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Change a contact person; deactivate or reactivate them (never delete). */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'customer:edit')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(contactUpdateSchema))
  return await updateContact(user, id, input)
})
