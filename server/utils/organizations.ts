import type { Transaction } from 'sequelize'
import { Organization } from '../models/Organization'

/** 400 naming `organizationId` unless it is an active organization. */
export async function assertActiveOrganization(id: number, transaction?: Transaction): Promise<Organization> {
  const org = await Organization.findByPk(id, { transaction })
  if (!org || !org.active) {
    throw createError({
      statusCode: 400,
      statusMessage: 'Validation Error',
      message: 'Invalid input: organizationId: No active organization with this id',
      data: { fields: { organizationId: 'No active organization with this id' } },
    })
  }
  return org
}
