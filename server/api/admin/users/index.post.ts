import { userCreateSchema } from '../../../../shared/schemas/user'
import { Organization } from '../../../models/Organization'
import { User } from '../../../models/User'
import { requireRole } from '../../../utils/access'
import { recordAudit, snapshot } from '../../../utils/audit'
import { userDTO } from '../../../utils/present'
import { inTransaction } from '../../../utils/transaction'
import { parseWith } from '../../../utils/validation'
import { assertActiveOrganization } from '../../../utils/organizations'

export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, 'admin')
  const input = await readValidatedBody(event, parseWith(userCreateSchema))
  const passwordHash = await hashPassword(input.password)
  const user = await inTransaction(async (t) => {
    if (input.organizationId) await assertActiveOrganization(input.organizationId, t)
    const created = await User.create(
      { email: input.email, name: input.name, role: input.role, organizationId: input.organizationId ?? null, passwordHash },
      { transaction: t },
    )
    await recordAudit(t, { userId: admin.id, action: 'create', entity: 'User', entityId: created.id, after: snapshot(created) })
    return created
  })
  await user.reload({ include: [{ model: Organization, as: 'organization' }] })
  setResponseStatus(event, 201)
  return userDTO(user)
})
