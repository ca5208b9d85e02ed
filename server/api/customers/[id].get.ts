import { idParamSchema } from '#shared/schemas/common'
import { customerDetail } from '#server/services/customers/customers'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** A customer with its contacts and audit trail. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'customer:read')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  return await customerDetail(id)
})
