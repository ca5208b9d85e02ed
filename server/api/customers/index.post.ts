import { customerCreateSchema } from '../../../shared/schemas/customer'
import { Organization } from '../../models/Organization'
import { requireRole } from '../../utils/access'
import { recordAudit, snapshot } from '../../utils/audit'
import { customerDTO } from '../../utils/presentRegisters'
import { inTransaction } from '../../utils/transaction'
import { parseWith } from '../../utils/validation'

/** A new customer organization with its certificate address. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'technician', 'quality', 'admin')
  const input = await readValidatedBody(event, parseWith(customerCreateSchema))
  const org = await inTransaction(async (t) => {
    const created = await Organization.create(
      { name: input.name, contactEmails: input.contactEmails, addressLines: input.addressLines, city: input.city, postcode: input.postcode ?? null, country: input.country },
      { transaction: t },
    )
    await recordAudit(t, { userId: user.id, action: 'create', entity: 'Organization', entityId: created.id, after: snapshot(created) })
    return created
  })
  setResponseStatus(event, 201)
  return customerDTO(org, 0)
})
