import { receivedQuerySchema } from '#shared/schemas/mail'
import { receivedMail } from '#server/services/mail/mailbox'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** What the local mail server received, newest first (demo and tests only: 404 without BANDLIGHT_MAILBOX_DIR). */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'mail:manage')
  const q = await getValidatedQuery(event, parseWith(receivedQuerySchema))
  return receivedMail(q.page, q.pageSize)
})
