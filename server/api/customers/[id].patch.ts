import { idParamSchema } from '#shared/schemas/common'
import { customerUpdateSchema } from '#shared/schemas/customer'
import { updateCustomer } from '#server/services/customers/customers'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Change a customer's name, address or addresses for mail; deactivate or reactivate it. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'customer:edit')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(customerUpdateSchema))
  return await updateCustomer(user, id, input)
})
