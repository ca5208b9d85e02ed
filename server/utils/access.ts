import type { H3Event } from 'h3'
import type { WhereOptions } from 'sequelize'
import type { Role } from '../../shared/roles'
import type { SessionUser } from '../../shared/types'
import { User } from '../models/User'

export function toSessionUser(user: User): SessionUser {
  return {
    id: user.id,
    name: user.name,
    email: user.email,
    role: user.role,
    organizationId: user.organizationId ?? null,
  }
}

/**
 * The signed-in user, checked against the database on every call (a deactivated
 * user or a changed role takes effect at once), or 401 / 403.
 * With no roles given any signed-in user passes. Call it first in every handler,
 * before validation, so an anonymous caller learns nothing about the input rules.
 */
export async function requireRole(event: H3Event, ...roles: Role[]): Promise<SessionUser> {
  const session = await getUserSession(event)
  const id = session.user?.id
  if (!id) throw createError({ statusCode: 401, statusMessage: 'Unauthorized', message: 'Sign in to continue' })
  const user = await User.findByPk(id)
  if (!user || !user.active) {
    await clearUserSession(event)
    throw createError({ statusCode: 401, statusMessage: 'Unauthorized', message: 'Sign in to continue' })
  }
  if (roles.length > 0 && !roles.includes(user.role)) {
    throw createError({ statusCode: 403, statusMessage: 'Forbidden', message: 'Your role may not do this' })
  }
  return toSessionUser(user)
}

/**
 * Where-clause that limits a query to what the user may see: a customer sees only its
 * own organization's rows (by the given column); lab staff see everything.
 */
export function organizationScope(user: SessionUser, column = 'organizationId'): WhereOptions {
  if (user.role !== 'customer') return {}
  return { [column]: user.organizationId ?? -1 }
}

/** 404 with a message naming the kind of record; used for missing and out-of-scope records alike. */
export function notFound(entity: string): never {
  throw createError({ statusCode: 404, statusMessage: 'Not Found', message: `No such ${entity}` })
}
