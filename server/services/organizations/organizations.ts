/**
 * Customer organizations as the administrator manages them (name, contact addresses, active); the
 * customer register (server/services/customers) adds their postal address and contacts.
 */
import type { Transaction } from 'sequelize'
import type { OrganizationCreateInput, OrganizationUpdateInput } from '#shared/schemas/organization'
import type { OrganizationDTO, SessionUser } from '#shared/types'
import { Organization } from '#server/models/Organization'
import { createAudited, updateAudited } from '#server/utils/audit'
import { assertVersion, invalidInput, notFound } from '#server/utils/errors'
import { inTransaction } from '#server/utils/transaction'
import { organizationDTO } from './dto'

/** 400 naming `organizationId` unless it is an active organization. */
export async function assertActiveOrganization(id: number, transaction?: Transaction): Promise<Organization> {
  const org = await Organization.findByPk(id, { transaction })
  if (!org || !org.active) invalidInput({ organizationId: 'No active organization with this id' })
  return org
}

export async function listOrganizations(): Promise<OrganizationDTO[]> {
  return (await Organization.findAll({ order: [['name', 'ASC']] })).map(organizationDTO)
}

export async function createOrganization(actor: SessionUser, input: OrganizationCreateInput): Promise<OrganizationDTO> {
  const org = await inTransaction(t => createAudited(t, actor, Organization, { name: input.name, contactEmails: input.contactEmails }, { entity: 'Organization' }))
  return organizationDTO(org)
}

/** Edit name and contact addresses, deactivate or reactivate (never delete). */
export async function updateOrganization(actor: SessionUser, id: number, input: OrganizationUpdateInput): Promise<OrganizationDTO> {
  const org = await inTransaction(async (t) => {
    const org = await Organization.findByPk(id, { transaction: t })
    if (!org) notFound('organization')
    assertVersion(org.version, input.version)
    const { version: _version, ...changes } = input
    await updateAudited(t, actor, org, changes, {
      entity: 'Organization',
      action: (before, after) => before.active && !after.active ? 'deactivate' : !before.active && after.active ? 'reactivate' : 'update',
    })
    return org
  })
  return organizationDTO(org)
}
