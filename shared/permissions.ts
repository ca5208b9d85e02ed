/**
 * The permission policy: every action a user can take, and the roles that may take it. The one
 * place roles are granted — the server (`requirePermission`), the pages and navigation (`can`) and
 * the access test (through the route matrix in ./routeAccess.ts) all read it.
 *
 * A permission is `area:action`. Scoping beyond the role (a customer sees only its own
 * organization's records, nobody approves their own work) is the services' business; this policy
 * answers only "may this role try at all".
 */
import { LAB_ROLES, ROLES, type Role } from './roles'

const QUALITY_AND_ADMIN = ['quality', 'admin'] as const satisfies readonly Role[]

export const PERMISSIONS = {
  /** Who am I, sign out. */
  'account:self': ROLES,

  'calculation:run': LAB_ROLES,

  'instrument:read': ROLES,
  'instrument:edit': LAB_ROLES,
  /** The whole register as CSV (customers see their own instruments in the portal, not the register). */
  'instrument:export': LAB_ROLES,
  'customer:read': LAB_ROLES,
  'customer:edit': LAB_ROLES,
  'responsivity:read': LAB_ROLES,
  'responsivity:edit': LAB_ROLES,
  /** Blackbody sources and reference instruments, with their own calibrations and certificates. */
  'equipment:read': LAB_ROLES,
  'equipment:edit': QUALITY_AND_ADMIN,
  'upload:read': ROLES,
  'upload:create': LAB_ROLES,

  'procedure:read': LAB_ROLES,
  'procedure:edit': QUALITY_AND_ADMIN,
  'run:read': LAB_ROLES,
  /** Enter and amend run data, submit for review. */
  'run:edit': LAB_ROLES,
  /** Return or approve a submitted run. */
  'run:review': ['quality'],
  'request:read': ROLES,
  'request:create': ['customer'],
  /** Agree, in the portal, to the terms the laboratory offered. */
  'request:agree': ['customer'],
  /** Review, accept or decline a customer's request. */
  'request:handle': LAB_ROLES,

  'certificate:read': ROLES,
  /** Sign and issue, amend, withdraw. */
  'certificate:sign': ['quality'],
  /** Reopen an issued certificate's run for correction (a new revision of the run). */
  'certificate:reopen': ['quality'],

  'settings:read': LAB_ROLES,
  'settings:edit': ['admin'],
  'user:manage': ['admin'],
  'organization:manage': ['admin'],
  'audit:read': ['admin'],
  'mail:manage': ['admin'],
} as const satisfies Record<string, readonly Role[]>

export type Permission = keyof typeof PERMISSIONS

/** Every permission, in the order above. */
export const PERMISSION_NAMES = Object.keys(PERMISSIONS) as Permission[]

/** The roles that hold a permission. */
export function rolesWith(permission: Permission): readonly Role[] {
  return PERMISSIONS[permission]
}

/** Whether a role (or a user with one) holds a permission; false for nobody. */
export function can(who: Role | { role: Role } | null | undefined, permission: Permission): boolean {
  const role = typeof who === 'string' ? who : who?.role
  return !!role && (PERMISSIONS[permission] as readonly Role[]).includes(role)
}
