import { idParamSchema } from '../../../shared/schemas/common'
import { customerUpdateSchema } from '../../../shared/schemas/customer'
import { Organization } from '../../models/Organization'
import { notFound, requireRole } from '../../utils/access'
import { recordAudit, snapshot } from '../../utils/audit'
import { customerDTO } from '../../utils/presentRegisters'
import { changes } from '../../utils/registers'
import { contactCounts } from '../../utils/registersCustomers'
import { assertVersion, inTransaction } from '../../utils/transaction'
import { parseWith } from '../../utils/validation'

/** Edit a customer's name, address and addresses for certificates; deactivate with `active: false`. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'technician', 'quality', 'admin')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(customerUpdateSchema))
  const org = await inTransaction(async (t) => {
    const org = await Organization.findByPk(id, { transaction: t })
    if (!org) notFound('customer')
    assertVersion(org.version, input.version)
    const before = snapshot(org)
    const set = Object.fromEntries(Object.entries(changes(input)).filter(([, v]) => v !== undefined))
    org.set(set)
    if (!org.changed()) return org
    await org.save({ transaction: t })
    const action = input.active === false && before.active ? 'deactivate' : input.active === true && !before.active ? 'reactivate' : 'update'
    await recordAudit(t, { userId: user.id, action, entity: 'Organization', entityId: org.id, before, after: snapshot(org) })
    return org
  })
  return customerDTO(org, (await contactCounts([id])).get(id) ?? 0)
})
