import { idParamSchema } from '../../../../../shared/schemas/common'
import { passwordResetSchema } from '../../../../../shared/schemas/user'
import { User } from '../../../../models/User'
import { notFound, requireRole } from '../../../../utils/access'
import { recordAudit } from '../../../../utils/audit'
import { revokeUserSessions } from '../../../../utils/sessions'
import { inTransaction } from '../../../../utils/transaction'
import { parseWith } from '../../../../utils/validation'

/** Set a new password for a user (the admin hands it over; the hash is never audited); every session of theirs ends. */
export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, 'admin')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const { password } = await readValidatedBody(event, parseWith(passwordResetSchema))
  const passwordHash = await hashPassword(password)
  await inTransaction(async (t) => {
    const user = await User.findByPk(id, { transaction: t })
    if (!user) notFound('user')
    user.passwordHash = passwordHash
    await user.save({ transaction: t })
    const ended = await revokeUserSessions(t, user.id, 'password-reset')
    await recordAudit(t, { userId: admin.id, action: 'reset-password', entity: 'User', entityId: user.id, after: { sessionsEnded: ended } })
  })
  return { ok: true }
})
