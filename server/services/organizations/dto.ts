/** Plain JSON for organizations. */
import type { OrganizationDTO } from '#shared/types'
import type { Organization } from '#server/models/Organization'

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
