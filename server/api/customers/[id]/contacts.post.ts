import { idParamSchema } from '#shared/schemas/common'
import { contactCreateSchema } from '#shared/schemas/customer'
import { addContact } from '#server/services/customers/customers'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Add a contact person to a customer. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'customer:edit')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(contactCreateSchema))
  const contact = await addContact(user, id, input)
  setResponseStatus(event, 201)
  return contact
})
