import { requireRole } from '../../utils/access'
import { recordAudit } from '../../utils/audit'
import { endSession } from '../../utils/sessions'
import { inTransaction } from '../../utils/transaction'

/** Sign out: this browser's session ends on the server, so its cookie is worthless from now on. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  await inTransaction(t => recordAudit(t, { userId: user.id, action: 'sign-out', entity: 'User', entityId: user.id }))
  await endSession(event)
  return { ok: true }
})
