import { LAB_ROLES } from '../../../shared/roles'
import { idParamSchema } from '../../../shared/schemas/common'
import type { CustomerDetailDTO } from '../../../shared/types'
import { Contact } from '../../models/Contact'
import { Organization } from '../../models/Organization'
import { notFound, requireRole } from '../../utils/access'
import { contactDTO, customerDTO } from '../../utils/presentRegisters'
import { auditTrail } from '../../utils/registers'
import { parseWith } from '../../utils/validation'

/** A customer with all its contacts (inactive ones too) and its audit trail. */
export default defineEventHandler(async (event): Promise<CustomerDetailDTO> => {
  await requireRole(event, ...LAB_ROLES)
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const org = await Organization.findByPk(id)
  if (!org) notFound('customer')
  const contacts = await Contact.findAll({ where: { organizationId: id }, order: [['active', 'DESC'], ['name', 'ASC'], ['id', 'ASC']] })
  return {
    ...customerDTO(org, contacts.filter(c => c.active).length),
    contacts: contacts.map(contactDTO),
    audit: await auditTrail('Organization', id),
  }
})
