/**
 * The people who sign in: created, edited, deactivated and given a new password by an
 * administrator. Never deleted. A change of role or organization, a new password and a
 * deactivation end every open session of the user (server/services/auth/sessions.ts).
 */
import type { Transaction } from 'sequelize'
import type { PasswordResetInput, UserCreateInput, UserUpdateInput } from '#shared/schemas/user'
import { can } from '#shared/permissions'
import { LAB_ROLES } from '#shared/roles'
import type { SessionUser, StaffMemberDTO, UserDTO } from '#shared/types'
import { Organization } from '#server/models/Organization'
import { User } from '#server/models/User'
import { recordAudit, createAudited, updateAudited } from '#server/utils/audit'
import { assertVersion, invalidInput, notFound } from '#server/utils/errors'
import { makePasswordHash } from '#server/utils/password'
import { inTransaction } from '#server/utils/transaction'
import { revokeUserSessions } from '#server/services/auth/sessions'
import { assertActiveOrganization } from '#server/services/organizations/organizations'
import { userDTO } from './dto'

async function userOut(id: number): Promise<UserDTO> {
  const user = await User.findByPk(id, { include: [{ model: Organization, as: 'organization' }] })
  if (!user) notFound('user')
  return userDTO(user)
}

async function findUser(t: Transaction, id: number): Promise<User> {
  const user = await User.findByPk(id, { transaction: t })
  if (!user) notFound('user')
  return user
}

/**
 * The laboratory's active staff who may perform runs (names and roles only): the people a request's
 * runs can be assigned to. Lab roles read it; it holds no e-mail and no customer.
 */
export async function listStaff(): Promise<StaffMemberDTO[]> {
  const users = await User.findAll({ where: { active: true, role: LAB_ROLES as unknown as string[] }, attributes: ['id', 'name', 'role'], order: [['name', 'ASC']] })
  return users.filter(u => can(u.role, 'run:edit')).map(u => ({ id: u.id, name: u.name, role: u.role }))
}

/** Every user (a lab has tens, not thousands: the page sorts and filters them). */
export async function listUsers(includeInactive: boolean): Promise<UserDTO[]> {
  const users = await User.findAll({
    where: includeInactive ? {} : { active: true },
    include: [{ model: Organization, as: 'organization' }],
    order: [['name', 'ASC']],
  })
  return users.map(userDTO)
}

export async function createUser(actor: SessionUser, input: UserCreateInput): Promise<UserDTO> {
  const passwordHash = await makePasswordHash(input.password)
  const user = await inTransaction(async (t) => {
    if (input.organizationId) await assertActiveOrganization(input.organizationId, t)
    return createAudited(t, actor, User, { email: input.email, name: input.name, role: input.role, organizationId: input.organizationId ?? null, passwordHash }, { entity: 'User' })
  })
  return userOut(user.id)
}

/** Edit name, role and organization; a new role or organization ends the user's sessions. */
export async function updateUser(actor: SessionUser, id: number, input: UserUpdateInput): Promise<UserDTO> {
  await inTransaction(async (t) => {
    const user = await findUser(t, id)
    assertVersion(user.version, input.version)
    const role = input.role ?? user.role
    const organizationId = input.organizationId !== undefined ? input.organizationId : user.organizationId
    if (role === 'customer' && !organizationId) invalidInput({ organizationId: 'A customer user belongs to an organization' })
    if (user.id === actor.id && role !== 'admin') invalidInput({ role: 'You cannot remove your own administrator role' })
    if (organizationId && organizationId !== user.organizationId) await assertActiveOrganization(organizationId, t)
    const access = { role: user.role, organizationId: user.organizationId }
    const next = { name: input.name ?? user.name, role, organizationId: role === 'customer' ? organizationId : null }
    const accessChanged = next.role !== access.role || next.organizationId !== access.organizationId
    const ended = accessChanged ? await revokeUserSessions(t, user.id, 'access-changed') : 0
    await updateAudited(t, actor, user, next, { entity: 'User', extra: ended ? { sessionsEnded: ended } : undefined })
  })
  return userOut(id)
}

/** Deactivate (ending every session) or reactivate a user. Nobody deactivates themselves. */
export async function setUserActive(actor: SessionUser, id: number, active: boolean): Promise<UserDTO> {
  if (id === actor.id && !active) invalidInput({ active: 'You cannot deactivate yourself' })
  await inTransaction(async (t) => {
    const user = await findUser(t, id)
    if (user.active === active) return
    const ended = active ? 0 : await revokeUserSessions(t, user.id, 'deactivated')
    await updateAudited(t, actor, user, { active }, { entity: 'User', action: active ? 'reactivate' : 'deactivate', extra: active ? undefined : { sessionsEnded: ended } })
  })
  return userOut(id)
}

/** Set a new password (the admin hands it over; the hash is never audited); every session of the user ends. */
export async function resetUserPassword(actor: SessionUser, id: number, input: PasswordResetInput): Promise<{ ok: true }> {
  const passwordHash = await makePasswordHash(input.password)
  await inTransaction(async (t) => {
    const user = await findUser(t, id)
    user.passwordHash = passwordHash
    await user.save({ transaction: t })
    const ended = await revokeUserSessions(t, user.id, 'password-reset')
    await recordAudit(t, { userId: actor.id, action: 'reset-password', entity: 'User', entityId: user.id, after: { sessionsEnded: ended } })
  })
  return { ok: true }
}
