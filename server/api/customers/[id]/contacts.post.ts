import { idParamSchema } from '../../../../shared/schemas/common'
import { contactCreateSchema } from '../../../../shared/schemas/customer'
import { Contact } from '../../../models/Contact'
import { Organization } from '../../../models/Organization'
import { notFound, requireRole } from '../../../utils/access'
import { recordAudit, snapshot } from '../../../utils/audit'
import { contactDTO } from '../../../utils/presentRegisters'
import { inTransaction } from '../../../utils/transaction'
import { parseWith } from '../../../utils/validation'

/** Add a contact person to a customer. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'technician', 'quality', 'admin')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(contactCreateSchema))
  const contact = await inTransaction(async (t) => {
    const org = await Organization.findByPk(id, { transaction: t })
    if (!org) notFound('customer')
    const created = await Contact.create({ organizationId: id, name: input.name, email: input.email, phone: input.phone ?? null, receivesReminders: input.receivesReminders }, { transaction: t })
    await recordAudit(t, { userId: user.id, action: 'create', entity: 'Contact', entityId: created.id, after: snapshot(created) })
    return created
  })
  setResponseStatus(event, 201)
  return contactDTO(contact)
})
