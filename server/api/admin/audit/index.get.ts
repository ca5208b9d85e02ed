import { Op, type WhereOptions } from 'sequelize'
import { auditQuerySchema } from '../../../../shared/schemas/audit'
import { AuditEvent } from '../../../models/AuditEvent'
import { User } from '../../../models/User'
import type { Page, AuditEventDTO } from '../../../../shared/types'
import { requireRole } from '../../../utils/access'
import { auditDTO } from '../../../utils/present'
import { parseWith } from '../../../utils/validation'

/** Browse the audit trail, newest first, filtered and paged on the server. Read-only. */
export default defineEventHandler(async (event): Promise<Page<AuditEventDTO>> => {
  await requireRole(event, 'admin')
  const q = await getValidatedQuery(event, parseWith(auditQuerySchema))
  const where: WhereOptions<AuditEvent> = {}
  if (q.entity) where.entity = q.entity
  if (q.entityId) where.entityId = q.entityId
  if (q.userId) where.userId = q.userId
  if (q.action) where.action = q.action
  if (q.from || q.to) {
    where.at = {
      ...(q.from ? { [Op.gte]: new Date(q.from) } : {}),
      ...(q.to ? { [Op.lte]: new Date(q.to) } : {}),
    }
  }
  const { rows, count } = await AuditEvent.findAndCountAll({
    where,
    order: [['at', 'DESC'], ['id', 'DESC']],
    limit: q.pageSize,
    offset: (q.page - 1) * q.pageSize,
  })
  const ids = [...new Set(rows.map(r => r.userId).filter((v): v is number => v !== null))]
  const users = ids.length ? await User.findAll({ where: { id: ids }, attributes: ['id', 'name'] }) : []
  const names = new Map(users.map(u => [u.id, u.name]))
  return { rows: rows.map(r => auditDTO(r, r.userId ? names.get(r.userId) ?? null : null)), total: count, page: q.page, pageSize: q.pageSize }
})
