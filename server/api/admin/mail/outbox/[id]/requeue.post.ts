import { idParamSchema } from '#shared/schemas/common'
import { requeueFailedMessage } from '#server/services/mail/outbox'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Queue a message that failed for good once more (after a mail outage); 409 unless it failed. */
export default defineEventHandler(async (event) => {
  const admin = await requirePermission(event, 'mail:manage')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  return await requeueFailedMessage(admin, id)
})
