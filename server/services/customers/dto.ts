/** Plain JSON for customers and their contacts (shared/types/registers.ts). */
import type { ContactDTO, CustomerDTO } from '#shared/types'
import type { Contact } from '#server/models/Contact'
import type { Organization } from '#server/models/Organization'
import { organizationDTO } from '#server/services/organizations/dto'

export function customerDTO(o: Organization, contactCount: number): CustomerDTO {
  return {
    ...organizationDTO(o),
    addressLines: o.addressLines ?? null,
    city: o.city ?? null,
    postcode: o.postcode ?? null,
    country: o.country ?? null,
    contactCount,
  }
}

export function contactDTO(c: Contact): ContactDTO {
  return {
    id: c.id,
    organizationId: c.organizationId,
    name: c.name,
    email: c.email,
    phone: c.phone ?? null,
    receivesReminders: !!c.receivesReminders,
    active: !!c.active,
    version: c.version,
    createdAt: c.createdAt.toISOString(),
    updatedAt: c.updatedAt.toISOString(),
  }
}
