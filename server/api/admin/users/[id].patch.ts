import { idParamSchema } from '../../../../shared/schemas/common'
import { userUpdateSchema } from '../../../../shared/schemas/user'
import { Organization } from '../../../models/Organization'
import { User } from '../../../models/User'
import { notFound, requireRole } from '../../../utils/access'
import { recordAudit, snapshot } from '../../../utils/audit'
import { revokeUserSessions } from '../../../utils/sessions'
import { assertActiveOrganization } from '../../../utils/organizations'
import { userDTO } from '../../../utils/present'
import { assertVersion, inTransaction } from '../../../utils/transaction'
import { parseWith } from '../../../utils/validation'

/** Edit name, role and organization. */
export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, 'admin')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(userUpdateSchema))
  await inTransaction(async (t) => {
    const user = await User.findByPk(id, { transaction: t })
    if (!user) notFound('user')
    assertVersion(user.version, input.version)
    const role = input.role ?? user.role
    const organizationId = input.organizationId !== undefined ? input.organizationId : user.organizationId
    if (role === 'customer' && !organizationId) {
      throw createError({ statusCode: 400, statusMessage: 'Validation Error', message: 'Invalid input: organizationId: A customer user belongs to an organization', data: { fields: { organizationId: 'A customer user belongs to an organization' } } })
    }
    if (user.id === admin.id && role !== 'admin') {
      throw createError({ statusCode: 400, statusMessage: 'Validation Error', message: 'Invalid input: role: You cannot remove your own administrator role', data: { fields: { role: 'You cannot remove your own administrator role' } } })
    }
    if (organizationId && organizationId !== user.organizationId) await assertActiveOrganization(organizationId, t)
    const before = snapshot(user)
    user.set({ name: input.name ?? user.name, role, organizationId: role === 'customer' ? organizationId : null })
    await user.save({ transaction: t })
    // A new role or organization changes what the user may see: their open sessions end.
    const ended = before.role !== user.role || before.organizationId !== user.organizationId ? await revokeUserSessions(t, user.id, 'access-changed') : 0
    await recordAudit(t, { userId: admin.id, action: 'update', entity: 'User', entityId: user.id, before, after: { ...snapshot(user), ...(ended ? { sessionsEnded: ended } : {}) } })
  })
  const user = await User.findByPk(id, { include: [{ model: Organization, as: 'organization' }] })
  return userDTO(user!)
})
