import { customerCreateSchema } from '#shared/schemas/customer'
import { createCustomer } from '#server/services/customers/customers'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Register a customer with the address printed on its certificates. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'customer:edit')
  const input = await readValidatedBody(event, parseWith(customerCreateSchema))
  const customer = await createCustomer(user, input)
  setResponseStatus(event, 201)
  return customer
})
