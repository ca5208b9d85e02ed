import { requireRole } from '../../utils/access'
import { recordAudit } from '../../utils/audit'
import { inTransaction } from '../../utils/transaction'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  await inTransaction(t => recordAudit(t, { userId: user.id, action: 'sign-out', entity: 'User', entityId: user.id }))
  await clearUserSession(event)
  return { ok: true }
})
