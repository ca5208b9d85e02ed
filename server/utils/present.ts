import type { AuditEventDTO, OrganizationDTO, UserDTO } from '../../shared/types'
import type { AuditEvent } from '../models/AuditEvent'
import type { Organization } from '../models/Organization'
import type { User } from '../models/User'

/** Plain JSON for a user (never the password hash). */
export function userDTO(u: User): UserDTO {
  return {
    id: u.id,
    email: u.email,
    name: u.name,
    role: u.role,
    organizationId: u.organizationId ?? null,
    organizationName: u.organization?.name ?? null,
    active: u.active,
    version: u.version,
    createdAt: u.createdAt.toISOString(),
    updatedAt: u.updatedAt.toISOString(),
  }
}

export function organizationDTO(o: Organization): OrganizationDTO {
  return {
    id: o.id,
    name: o.name,
    contactEmails: o.contactEmails ?? [],
    active: o.active,
    version: o.version,
    createdAt: o.createdAt.toISOString(),
    updatedAt: o.updatedAt.toISOString(),
  }
}

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
