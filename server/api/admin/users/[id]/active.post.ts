import { idParamSchema } from '../../../../../shared/schemas/common'
import { activeFlagSchema } from '../../../../../shared/schemas/user'
import { Organization } from '../../../../models/Organization'
import { User } from '../../../../models/User'
import { notFound, requireRole } from '../../../../utils/access'
import { recordAudit, snapshot } from '../../../../utils/audit'
import { revokeUserSessions } from '../../../../utils/sessions'
import { userDTO } from '../../../../utils/present'
import { inTransaction } from '../../../../utils/transaction'
import { parseWith } from '../../../../utils/validation'

/** Deactivate (or reactivate) a user; deactivation ends every session of theirs. Users are never deleted. */
export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, 'admin')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const { active } = await readValidatedBody(event, parseWith(activeFlagSchema))
  if (id === admin.id && !active) {
    throw createError({ statusCode: 400, statusMessage: 'Validation Error', message: 'Invalid input: active: You cannot deactivate yourself', data: { fields: { active: 'You cannot deactivate yourself' } } })
  }
  await inTransaction(async (t) => {
    const user = await User.findByPk(id, { transaction: t })
    if (!user) notFound('user')
    if (user.active === active) return
    const before = snapshot(user)
    user.active = active
    await user.save({ transaction: t })
    const ended = active ? 0 : await revokeUserSessions(t, user.id, 'deactivated')
    await recordAudit(t, { userId: admin.id, action: active ? 'reactivate' : 'deactivate', entity: 'User', entityId: user.id, before, after: { ...snapshot(user), ...(active ? {} : { sessionsEnded: ended }) } })
  })
  const user = await User.findByPk(id, { include: [{ model: Organization, as: 'organization' }] })
  return userDTO(user!)
})
