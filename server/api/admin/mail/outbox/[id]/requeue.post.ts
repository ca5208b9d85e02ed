import { idParamSchema } from '../../../../../../shared/schemas/common'
import { notFound, requireRole } from '../../../../../utils/access'
import { outboxDTO, requeueMessage } from '../../../../../utils/outbox'
import { inTransaction } from '../../../../../utils/transaction'
import { parseWith } from '../../../../../utils/validation'

/** Queue a message that failed for good once more (after a mail outage); 409 unless it failed. */
export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, 'admin')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const done = await inTransaction(t => requeueMessage(t, admin.id, id))
  if (!done) notFound('message')
  if (!done.requeued) {
    throw createError({ statusCode: 409, statusMessage: 'Conflict', message: `Only a failed message can be queued again; this one is ${done.row.status}`, data: { fields: { status: done.row.status } } })
  }
  return outboxDTO(done.row)
})
