import type { WhereOptions } from 'sequelize'
import { outboxQuerySchema } from '../../../../../shared/schemas/mail'
import type { OutboxMessageDTO, Page } from '../../../../../shared/types'
import { OutboxMessage } from '../../../../models/OutboxMessage'
import { requireRole } from '../../../../utils/access'
import { outboxDTO } from '../../../../utils/outbox'
import { parseWith } from '../../../../utils/validation'

/** The outbox, newest first, paged; filter by status or kind. */
export default defineEventHandler(async (event): Promise<Page<OutboxMessageDTO>> => {
  await requireRole(event, 'admin')
  const q = await getValidatedQuery(event, parseWith(outboxQuerySchema))
  const where: WhereOptions<OutboxMessage> = {}
  if (q.status) where.status = q.status
  if (q.kind) where.kind = q.kind
  const { rows, count } = await OutboxMessage.findAndCountAll({
    where,
    order: [['createdAt', 'DESC'], ['id', 'DESC']],
    limit: q.pageSize,
    offset: (q.page - 1) * q.pageSize,
  })
  return { rows: rows.map(outboxDTO), total: count, page: q.page, pageSize: q.pageSize }
})
