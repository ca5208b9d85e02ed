/** Plain JSON for users (never the password hash). */
import type { UserDTO } from '#shared/types'
import type { User } from '#server/models/User'

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
