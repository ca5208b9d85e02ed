/**
 * Revocable sessions. The sealed cookie of nuxt-auth-utils carries the signed-in user (for the
 * pages) and, in its `secure` part that never reaches the browser's scripts, the id of a
 * `UserSession` record. The server trusts the cookie only while that record exists, has not
 * expired and has not been revoked, and while the user is active: sign-out revokes the session;
 * a password reset, a deactivation or a change of role revokes every session of the user at once.
 */
import crypto from 'node:crypto'
import type { H3Event } from 'h3'
import { Op, type Transaction } from 'sequelize'
import type { SessionUser } from '#shared/types'
import { User } from '#server/models/User'
import { UserSession } from '#server/models/UserSession'
import { serializeWrites } from '#server/utils/db'
import { clientAddress, clientUserAgent } from '#server/utils/request'

/** How long a session lasts from sign-in (the cookie's own max age is the same). */
export const SESSION_MAX_AGE_S = 60 * 60 * 12

export function toSessionUser(user: User): SessionUser {
  return {
    id: user.id,
    name: user.name,
    email: user.email,
    role: user.role,
    organizationId: user.organizationId ?? null,
  }
}

/** Start a session for a user who has just proved who they are; replaces whatever the cookie held. */
export async function startSession(event: H3Event, user: User): Promise<SessionUser> {
  const id = crypto.randomBytes(32).toString('base64url')
  const now = new Date()
  await serializeWrites(() => UserSession.create({
    id,
    userId: user.id,
    createdAt: now,
    expiresAt: new Date(now.getTime() + SESSION_MAX_AGE_S * 1000),
    revokedAt: null,
    revokedReason: null,
    address: clientAddress(event).slice(0, 100),
    userAgent: clientUserAgent(event) || null,
  }))
  const sessionUser = toSessionUser(user)
  await replaceUserSession(event, { user: sessionUser, secure: { sessionId: id }, loggedInAt: now.toISOString() })
  return sessionUser
}

/** The session record's id the cookie names, or null. */
async function sessionIdOf(event: H3Event): Promise<{ sessionId: string, userId: number } | null> {
  const session = await getUserSession(event)
  const sessionId = session.secure?.sessionId
  const userId = session.user?.id
  if (typeof sessionId !== 'string' || typeof userId !== 'number') return null
  return { sessionId, userId }
}

/**
 * The user of a live session, read from the database on every call (a deactivation, a revoked
 * session or a changed role takes effect at once), or null.
 */
export async function currentUser(event: H3Event): Promise<User | null> {
  const ids = await sessionIdOf(event)
  if (!ids) return null
  const row = await UserSession.findByPk(ids.sessionId)
  if (!row || row.userId !== ids.userId || row.revokedAt || row.expiresAt.getTime() <= Date.now()) return null
  const user = await User.findByPk(row.userId)
  return user && user.active ? user : null
}

/** End this browser's session (sign-out). */
export async function endSession(event: H3Event): Promise<void> {
  const ids = await sessionIdOf(event)
  if (ids) {
    await serializeWrites(() => UserSession.update({ revokedAt: new Date(), revokedReason: 'sign-out' }, { where: { id: ids.sessionId, revokedAt: null } }))
  }
  await clearUserSession(event)
}

/** Revoke every live session of a user, in the caller's transaction; returns how many. */
export async function revokeUserSessions(t: Transaction, userId: number, reason: string): Promise<number> {
  const [n] = await UserSession.update(
    { revokedAt: new Date(), revokedReason: reason },
    { where: { userId, revokedAt: null, expiresAt: { [Op.gt]: new Date() } }, transaction: t },
  )
  return n
}
