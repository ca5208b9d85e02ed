/** The audit trail of one record, as the detail pages show it. */
import type { AuditEventDTO } from '#shared/types'
import { AuditEvent } from '#server/models/AuditEvent'
import { withUserNames } from './audit'

/** The audit rows of one record, oldest first, with the names of the people who made them. */
export async function auditTrail(entity: string, entityId: number): Promise<AuditEventDTO[]> {
  return withUserNames(await AuditEvent.findAll({ where: { entity, entityId }, order: [['at', 'ASC'], ['id', 'ASC']], limit: 1000 }))
}
