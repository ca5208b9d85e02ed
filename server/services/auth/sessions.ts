/**
 * Revocable sessions. The sealed cookie of nuxt-auth-utils carries the signed-in user (for the
 * pages) and, in its `secure` part that never reaches the browser's scripts, the id of a
 * `UserSession` record. The server trusts the cookie only while that record exists, has not
 * expired and has not been revoked, and while the user is active: sign-out revokes the session;
 * a password reset, a deactivation or a change of role revokes every session of the user at once.
 *
 * Cached per session, checked on every request: what a cookie unseals to is kept by the cookie's
 * text, and the session's user by the session's id, each for at most {@link USER_CACHE_MS}. A cached
 * user is used only while the change counter `sessions` (server/utils/changeCounters.ts) reads what
 * it read before the user was loaded; database triggers (migration 0015) move that counter in the
 * same transaction as every revocation or deletion of a session and every change of a user's name,
 * e-mail, role, organization, active flag or password. So each request reads one small row instead
 * of unsealing the cookie and reading the session and the user, and a revocation on any instance
 * takes effect on the next request everywhere.
 */
import crypto from 'node:crypto'
import { getCookie, type H3Event } from 'h3'
import { Op, type Transaction } from 'sequelize'
import type { SessionUser } from '#shared/types'
import { User } from '#server/models/User'
import { UserSession } from '#server/models/UserSession'
import { changeCounter } from '#server/utils/changeCounters'
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

/** How long an unsealed cookie and a session's user are kept (each use still checks the change counter). */
export const USER_CACHE_MS = 30_000
/** Most sessions kept in each cache (the oldest entries go first). */
const CACHE_MAX = 5000
/** The session cookie's name (runtimeConfig.session.name in nuxt.config.ts). */
const COOKIE = 'bandlight-session'

interface SessionIds { sessionId: string, userId: number }
const unsealed = new Map<string, SessionIds & { at: number }>()
const users = new Map<string, { user: User, userId: number, version: number, at: number, expiresAt: number }>()

function remember<K, V>(map: Map<K, V>, key: K, value: V): void {
  map.delete(key)
  map.set(key, value)
  if (map.size > CACHE_MAX) map.delete(map.keys().next().value!)
}

/** The session record's id the cookie names, or null (the cookie unsealed once per {@link USER_CACHE_MS}). */
async function sessionIdOf(event: H3Event): Promise<SessionIds | null> {
  const cookie = getCookie(event, COOKIE)
  const now = Date.now()
  if (cookie) {
    const hit = unsealed.get(cookie)
    if (hit && now - hit.at < USER_CACHE_MS) return { sessionId: hit.sessionId, userId: hit.userId }
  }
  const session = await getUserSession(event)
  const sessionId = session.secure?.sessionId
  const userId = session.user?.id
  if (typeof sessionId !== 'string' || typeof userId !== 'number') return null
  if (cookie) remember(unsealed, cookie, { sessionId, userId, at: now })
  return { sessionId, userId }
}

/** True when the request carries a session cookie naming a session (not yet checked against the database). */
export async function hasSessionCookie(event: H3Event): Promise<boolean> {
  return (await sessionIdOf(event)) !== null
}

/**
 * The user of a live session, or null. A deactivation, a revoked session or a changed role takes
 * effect at once: the user is read from the database unless it was read for this session within
 * {@link USER_CACHE_MS} and the change counter `sessions` has not moved since (see the module's note).
 * The returned record may be shared between requests: read it, never change it.
 */
export async function currentUser(event: H3Event): Promise<User | null> {
  const ids = await sessionIdOf(event)
  if (!ids) return null
  // read before the session and the user, so a cached user is never older than its counter value
  const version = await changeCounter('sessions')
  const now = Date.now()
  const hit = users.get(ids.sessionId)
  if (hit && hit.version === version && version >= 0 && hit.userId === ids.userId && now - hit.at < USER_CACHE_MS && hit.expiresAt > now) return hit.user
  const row = await UserSession.findByPk(ids.sessionId)
  if (!row || row.userId !== ids.userId || row.revokedAt || row.expiresAt.getTime() <= now) return null
  const user = await User.findByPk(row.userId)
  if (!user || !user.active) return null
  if (version >= 0) remember(users, ids.sessionId, { user, userId: user.id, version, at: now, expiresAt: row.expiresAt.getTime() })
  return user
}

/** End this browser's session (sign-out). */
export async function endSession(event: H3Event): Promise<void> {
  const ids = await sessionIdOf(event)
  if (ids) {
    await serializeWrites(() => UserSession.update({ revokedAt: new Date(), revokedReason: 'sign-out' }, { where: { id: ids.sessionId, revokedAt: null } }))
    users.delete(ids.sessionId)
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
