import { loginSchema } from '../../../shared/schemas/auth'
import { User } from '../../models/User'
import { toSessionUser } from '../../utils/access'
import { recordAudit } from '../../utils/audit'
import { inTransaction } from '../../utils/transaction'
import { clearFailures, recordFailure, throttledFor } from '../../utils/throttle'
import { parseWith } from '../../utils/validation'

const WRONG = 'E-mail or password is not correct'

// A fixed hash to compare against when the e-mail is unknown, so both paths take the same time.
let decoyHash: string | undefined

export default defineEventHandler(async (event) => {
  const { email, password } = await readValidatedBody(event, parseWith(loginSchema))
  const address = getRequestIP(event, { xForwardedFor: process.env.TRUST_PROXY === '1' }) ?? 'unknown'

  const wait = throttledFor(email, address)
  if (wait > 0) {
    setResponseHeader(event, 'Retry-After', wait)
    throw createError({ statusCode: 429, statusMessage: 'Too Many Requests', message: `Too many failed sign-ins. Try again in ${Math.ceil(wait / 60)} min.` })
  }

  const user = await User.findOne({ where: { email } })
  decoyHash ??= await hashPassword('decoy-password-for-timing')
  const ok = await verifyPassword(user?.passwordHash ?? decoyHash, password)
  if (!user || !ok || !user.active) {
    recordFailure(email, address)
    throw createError({ statusCode: 401, statusMessage: 'Unauthorized', message: WRONG })
  }

  clearFailures(email)
  const sessionUser = toSessionUser(user)
  await setUserSession(event, { user: sessionUser, loggedInAt: new Date().toISOString() })
  await inTransaction(t => recordAudit(t, { userId: user.id, action: 'sign-in', entity: 'User', entityId: user.id }))
  return sessionUser
})
