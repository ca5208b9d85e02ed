import { loginSchema } from '../../../shared/schemas/auth'
import { User } from '../../models/User'
import { recordAudit } from '../../utils/audit'
import { tooManyRequests, waitInWords } from '../../utils/rateLimit'
import { clientAddress, clientUserAgent } from '../../utils/request'
import { startSession } from '../../utils/sessions'
import { clearSignInFailures, recordSignInFailure, signInGate } from '../../utils/throttle'
import { inTransaction } from '../../utils/transaction'
import { parseWith } from '../../utils/validation'

const WRONG = 'E-mail or password is not correct'

// A fixed hash to compare against when the e-mail is unknown, so both paths take the same time.
let decoyHash: string | undefined

/**
 * Sign in with e-mail and password. Throttled without locking others out (server/utils/throttle.ts);
 * every failure is audited with the address and user agent.
 */
export default defineEventHandler(async (event) => {
  const { email, password } = await readValidatedBody(event, parseWith(loginSchema))
  const address = clientAddress(event)

  const gate = await signInGate(email, address)
  if (gate.wait > 0) tooManyRequests(event, gate.wait, `Too many failed sign-ins. Try again in ${waitInWords(gate.wait)}.`)
  if (gate.delayMs > 0) await new Promise(r => setTimeout(r, gate.delayMs))

  const user = await User.findOne({ where: { email } })
  decoyHash ??= await hashPassword('decoy-password-for-timing')
  const ok = await verifyPassword(user?.passwordHash ?? decoyHash, password)
  if (!user || !ok || !user.active) {
    await recordSignInFailure(email, address, !!user)
    const reason = !user ? 'unknown-account' : !ok ? 'wrong-password' : 'inactive-account'
    await inTransaction(t => recordAudit(t, {
      userId: user?.id ?? null,
      action: 'sign-in-failed',
      entity: 'User',
      entityId: user?.id ?? null,
      after: { email, reason, address, userAgent: clientUserAgent(event) },
    }))
    if (gate.addressOverCeiling) tooManyRequests(event, 60, 'Too many failed sign-ins from this address. Try again in 1 min.')
    throw createError({ statusCode: 401, statusMessage: 'Unauthorized', message: WRONG })
  }

  await clearSignInFailures(email, address)
  const sessionUser = await startSession(event, user)
  await inTransaction(t => recordAudit(t, { userId: user.id, action: 'sign-in', entity: 'User', entityId: user.id, after: { address, userAgent: clientUserAgent(event) } }))
  return sessionUser
})
