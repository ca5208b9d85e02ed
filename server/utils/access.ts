/**
 * Access, from the one permission policy (shared/permissions.ts): every handler starts with
 * `requirePermission(event, 'area:action')` — before validation, so an anonymous caller learns
 * nothing about the input rules — and customers' queries are scoped with `organizationScope`.
 */
import { createError, type H3Event } from 'h3'
import type { WhereOptions } from 'sequelize'
import { can, type Permission } from '#shared/permissions'
import type { Role } from '#shared/roles'
import type { SessionUser } from '#shared/types'
import { currentUser, toSessionUser } from '#server/services/auth/sessions'
import { recordAudit } from './audit'
import { clientAddress, clientUserAgent } from './request'
import { inTransaction } from './transaction'

/**
 * The signed-in user of a live session, checked against the database on every call (a revoked
 * session, a deactivated user or a changed role takes effect at once), or 401; 403 when their
 * role does not hold the permission. A refusal (403) is written to the audit trail with the
 * caller's address and user agent.
 */
export async function requirePermission(event: H3Event, permission: Permission): Promise<SessionUser> {
  const user = await currentUser(event)
  if (!user) {
    await clearUserSession(event)
    throw createError({ statusCode: 401, statusMessage: 'Unauthorized', message: 'Sign in to continue' })
  }
  if (!can(user.role, permission)) {
    await auditRefusal(event, user.id, user.role, permission)
    throw createError({ statusCode: 403, statusMessage: 'Forbidden', message: 'Your role may not do this' })
  }
  return toSessionUser(user)
}

/** Record a refused request (403) in the audit trail. */
export async function auditRefusal(event: H3Event, userId: number, role: Role, permission: string): Promise<void> {
  await inTransaction(t => recordAudit(t, {
    userId,
    action: 'refused',
    entity: 'Request',
    entityId: null,
    after: { method: event.method, path: event.path.split('?')[0]!.slice(0, 300), role, permission, address: clientAddress(event), userAgent: clientUserAgent(event) },
  }))
}

/**
 * Where-clause that limits a query to what the user may see: a customer sees only its
 * own organization's rows (by the given column); lab staff see everything.
 */
export function organizationScope(user: SessionUser, column = 'organizationId'): WhereOptions {
  if (user.role !== 'customer') return {}
  return { [column]: user.organizationId ?? -1 }
}
