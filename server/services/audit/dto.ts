/** Plain JSON for audit rows. */
import type { AuditEventDTO } from '#shared/types'
import type { AuditEvent } from '#server/models/AuditEvent'

export function auditDTO(a: AuditEvent, userName: string | null): AuditEventDTO {
  return {
    id: a.id,
    at: a.at.toISOString(),
    userId: a.userId,
    userName,
    action: a.action,
    entity: a.entity,
    entityId: a.entityId,
    before: a.before,
    after: a.after,
  }
}
