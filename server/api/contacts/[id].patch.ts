import { idParamSchema } from '../../../shared/schemas/common'
import { contactUpdateSchema } from '../../../shared/schemas/customer'
import { Contact } from '../../models/Contact'
import { notFound, requireRole } from '../../utils/access'
import { recordAudit, snapshot } from '../../utils/audit'
import { contactDTO } from '../../utils/presentRegisters'
import { changes } from '../../utils/registers'
import { assertVersion, inTransaction } from '../../utils/transaction'
import { parseWith } from '../../utils/validation'

/** Edit a contact, or deactivate it (`active: false`); contacts are never deleted. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'technician', 'quality', 'admin')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(contactUpdateSchema))
  const contact = await inTransaction(async (t) => {
    const contact = await Contact.findByPk(id, { transaction: t })
    if (!contact) notFound('contact')
    assertVersion(contact.version, input.version)
    const before = snapshot(contact)
    contact.set(Object.fromEntries(Object.entries(changes(input)).filter(([, v]) => v !== undefined)))
    if (!contact.changed()) return contact
    await contact.save({ transaction: t })
    const action = input.active === false && before.active ? 'deactivate' : input.active === true && !before.active ? 'reactivate' : 'update'
    await recordAudit(t, { userId: user.id, action, entity: 'Contact', entityId: contact.id, before, after: snapshot(contact) })
    return contact
  })
  return contactDTO(contact)
})
