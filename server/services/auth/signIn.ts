/**
 * Signing in and out. Throttled without letting anyone lock others out (server/utils/throttle.ts);
 * every failure is audited with the address and user agent; a success starts a server-side session.
 */
import { createError, type H3Event } from 'h3'
import type { LoginInput } from '#shared/schemas/auth'
import type { SessionUser } from '#shared/types'
import { User } from '#server/models/User'
import { recordAudit } from '#server/utils/audit'
import { tooManyRequests, waitInWords } from '#server/utils/errors'
import { makePasswordHash, passwordMatches } from '#server/utils/password'
import { clientAddress, clientUserAgent } from '#server/utils/request'
import { clearSignInFailures, recordSignInFailure, signInGate } from '#server/utils/throttle'
import { inTransaction } from '#server/utils/transaction'
import { endSession, startSession } from './sessions'

const WRONG = 'E-mail or password is not correct'

// A fixed hash to compare against when the e-mail is unknown, so both paths take the same time.
let decoyHash: Promise<string> | undefined

export async function signIn(event: H3Event, { email, password }: LoginInput): Promise<SessionUser> {
  const address = clientAddress(event)
  const gate = await signInGate(email, address)
  if (gate.wait > 0) tooManyRequests(event, gate.wait, `Too many failed sign-ins. Try again in ${waitInWords(gate.wait)}.`)
  if (gate.delayMs > 0) await new Promise(r => setTimeout(r, gate.delayMs))

  const user = await User.findOne({ where: { email } })
  decoyHash ??= makePasswordHash('decoy-password-for-timing')
  const ok = await passwordMatches(user?.passwordHash ?? await decoyHash, password)
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
}

/** Sign out: this browser's session ends on the server, so its cookie is worthless from now on. */
export async function signOut(event: H3Event, user: SessionUser): Promise<{ ok: true }> {
  await inTransaction(t => recordAudit(t, { userId: user.id, action: 'sign-out', entity: 'User', entityId: user.id }))
  await endSession(event)
  return { ok: true }
}
