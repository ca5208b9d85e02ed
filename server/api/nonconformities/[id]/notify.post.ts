import { idParamSchema } from '#shared/schemas/common'
import { nonconformityNotifySchema } from '#shared/schemas/nonconformity'
import { notifyCustomers } from '#server/services/nonconformities/nonconformities'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Tell the customers of the affected work (all, or those named), through the outbox. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'nonconformity:manage')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(nonconformityNotifySchema))
  return await notifyCustomers(user, id, input)
})
