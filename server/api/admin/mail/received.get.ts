import { receivedQuerySchema } from '../../../../shared/schemas/mail'
import type { Page, ReceivedMessageDTO } from '../../../../shared/types'
import { requireRole } from '../../../utils/access'
import { listReceived, mailboxDir } from '../../../utils/mailbox'
import { parseWith } from '../../../utils/validation'

/** What the local mail server received, newest first (demo and tests only: 404 without BANDLIGHT_MAILBOX_DIR). */
export default defineEventHandler(async (event): Promise<Page<ReceivedMessageDTO>> => {
  await requireRole(event, 'admin')
  const q = await getValidatedQuery(event, parseWith(receivedQuerySchema))
  const dir = mailboxDir()
  if (!dir) throw createError({ statusCode: 404, statusMessage: 'Not Found', message: 'No local mailbox: this server sends to a real mail server' })
  const { rows, total } = listReceived(dir, q.page, q.pageSize)
  return { rows, total, page: q.page, pageSize: q.pageSize }
})
