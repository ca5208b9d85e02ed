import { can, rolesWith, type Permission } from './permissions'
import type { Role } from './roles'

export const NAV_GROUPS = ['Work', 'Quality', 'Registers', 'Administration'] as const
export type NavGroup = (typeof NAV_GROUPS)[number]

export interface NavItem {
  /** Route path. */
  to: string
  label: string
  /** The permission a user needs to use the page (./permissions.ts); the server's routes check the same policy. */
  permission: Permission
  /** Group heading in the side rail. */
  group: NavGroup
}

/**
 * Every page of the product and who may use it: the layout shows each user its own items.
 * Listed in the order the rail shows them (by group, as in NAV_GROUPS), so navFor(role) reads as the rail does.
 */
export const NAV_ITEMS: readonly NavItem[] = [
  { to: '/', label: 'Overview', permission: 'account:self', group: 'Work' },
  { to: '/runs', label: 'Calibration runs', permission: 'run:read', group: 'Work' },
  { to: '/certificates', label: 'Certificates', permission: 'certificate:read', group: 'Work' },
  { to: '/requests', label: 'Calibration requests', permission: 'request:read', group: 'Work' },
  { to: '/complaints', label: 'Complaints', permission: 'complaint:read', group: 'Work' },
  { to: '/calculator', label: 'Calculator', permission: 'calculation:run', group: 'Work' },
  { to: '/quotes', label: 'Quotes', permission: 'quote:read', group: 'Work' },
  { to: '/orders', label: 'Orders', permission: 'order:read', group: 'Work' },
  { to: '/invoices', label: 'Invoices', permission: 'invoice:read', group: 'Work' },
  { to: '/quality', label: 'Quality overview', permission: 'quality:overview', group: 'Quality' },
  { to: '/quality/checks', label: 'Checks', permission: 'check:read', group: 'Quality' },
  { to: '/quality/nonconformities', label: 'Nonconformities', permission: 'nonconformity:read', group: 'Quality' },
  { to: '/quality/actions', label: 'Corrective actions', permission: 'action:read', group: 'Quality' },
  { to: '/quality/proficiency', label: 'Proficiency', permission: 'proficiency:read', group: 'Quality' },
  { to: '/instruments', label: 'Instruments', permission: 'instrument:read', group: 'Registers' },
  { to: '/customers', label: 'Customers', permission: 'customer:read', group: 'Registers' },
  { to: '/sources', label: 'Blackbody sources', permission: 'equipment:read', group: 'Registers' },
  { to: '/reference-instruments', label: 'Reference instruments', permission: 'equipment:read', group: 'Registers' },
  { to: '/responsivities', label: 'Responsivity tables', permission: 'responsivity:read', group: 'Registers' },
  { to: '/procedures', label: 'Procedures', permission: 'procedure:read', group: 'Registers' },
  { to: '/admin/lab', label: 'Laboratory settings', permission: 'settings:edit', group: 'Administration' },
  { to: '/admin/prices', label: 'Prices', permission: 'billing:manage', group: 'Administration' },
  { to: '/admin/users', label: 'Users', permission: 'user:manage', group: 'Administration' },
  { to: '/admin/organizations', label: 'Customer organizations', permission: 'organization:manage', group: 'Administration' },
  { to: '/admin/audit', label: 'Audit trail', permission: 'audit:read', group: 'Administration' },
  { to: '/admin/mail', label: 'Mail', permission: 'mail:manage', group: 'Administration' },
]

/** Pages below a nav item that need more than reading it (the forms that create records). */
export const PAGE_PERMISSIONS: readonly { to: string, permission: Permission }[] = [
  { to: '/runs/new', permission: 'run:edit' },
  { to: '/instruments/new', permission: 'instrument:edit' },
  { to: '/customers/new', permission: 'customer:edit' },
  { to: '/sources/new', permission: 'equipment:edit' },
  { to: '/reference-instruments/new', permission: 'equipment:edit' },
  { to: '/procedures/new', permission: 'procedure:edit' },
]

export function navFor(role: Role): NavItem[] {
  return NAV_ITEMS.filter(item => can(role, item.permission))
}

/** The permission a path needs, by the longest matching page prefix; undefined = any signed-in user. */
export function permissionForPath(path: string): Permission | undefined {
  let best: { to: string, permission: Permission } | undefined
  for (const item of [...NAV_ITEMS, ...PAGE_PERMISSIONS]) {
    if (item.to === '/') continue
    if ((path === item.to || path.startsWith(item.to + '/')) && (!best || item.to.length > best.to.length)) best = item
  }
  return best?.permission
}

/** The roles allowed on a path, by the longest matching page prefix; undefined = any signed-in user. */
export function rolesForPath(path: string): readonly Role[] | undefined {
  const permission = permissionForPath(path)
  return permission ? rolesWith(permission) : undefined
}
