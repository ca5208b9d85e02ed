/** The audit trail as the administrator browses it: newest first, filtered and paged on the server. Read-only. */
import { Op, type WhereOptions } from 'sequelize'
import type { AuditQuery } from '#shared/schemas/audit'
import type { AuditEventDTO, Page } from '#shared/types'
import { AuditEvent } from '#server/models/AuditEvent'
import { User } from '#server/models/User'
import { auditDTO } from './dto'

export async function listAudit(q: AuditQuery): Promise<Page<AuditEventDTO>> {
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
  return { rows: await withUserNames(rows), total: count, page: q.page, pageSize: q.pageSize }
}

/** Audit rows as DTOs with the names of the people who made them. */
export async function withUserNames(rows: AuditEvent[]): Promise<AuditEventDTO[]> {
  const ids = [...new Set(rows.map(r => r.userId).filter((v): v is number => v !== null))]
  const users = ids.length ? await User.findAll({ where: { id: ids }, attributes: ['id', 'name'] }) : []
  const names = new Map(users.map(u => [u.id, u.name]))
  return rows.map(r => auditDTO(r, r.userId ? names.get(r.userId) ?? null : null))
}
