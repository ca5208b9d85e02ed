import type { Role } from './roles'

export const NAV_GROUPS = ['Work', 'Registers', 'Administration'] as const
export type NavGroup = (typeof NAV_GROUPS)[number]

export interface NavItem {
  /** Route path. */
  to: string
  label: string
  /** Roles that may use the page; the server checks the same roles in its routes. */
  roles: readonly Role[]
  /** Group heading in the side rail. */
  group: NavGroup
}

/**
 * Every page of the product and who may use it: the layout shows each role its own items.
 * Listed in the order the rail shows them (by group, as in NAV_GROUPS), so navFor(role) reads as the rail does.
 */
export const NAV_ITEMS: readonly NavItem[] = [
  { to: '/', label: 'Overview', roles: ['admin', 'technician', 'quality', 'customer'], group: 'Work' },
  { to: '/runs', label: 'Calibration runs', roles: ['admin', 'technician', 'quality'], group: 'Work' },
  { to: '/certificates', label: 'Certificates', roles: ['admin', 'technician', 'quality', 'customer'], group: 'Work' },
  { to: '/requests', label: 'Calibration requests', roles: ['admin', 'technician', 'quality', 'customer'], group: 'Work' },
  { to: '/calculator', label: 'Calculator', roles: ['admin', 'technician', 'quality'], group: 'Work' },
  { to: '/instruments', label: 'Instruments', roles: ['admin', 'technician', 'quality', 'customer'], group: 'Registers' },
  { to: '/customers', label: 'Customers', roles: ['admin', 'technician', 'quality'], group: 'Registers' },
  { to: '/sources', label: 'Blackbody sources', roles: ['admin', 'technician', 'quality'], group: 'Registers' },
  { to: '/reference-instruments', label: 'Reference instruments', roles: ['admin', 'technician', 'quality'], group: 'Registers' },
  { to: '/responsivities', label: 'Responsivity tables', roles: ['admin', 'technician', 'quality'], group: 'Registers' },
  { to: '/procedures', label: 'Procedures', roles: ['admin', 'technician', 'quality'], group: 'Registers' },
  { to: '/admin/lab', label: 'Laboratory settings', roles: ['admin'], group: 'Administration' },
  { to: '/admin/users', label: 'Users', roles: ['admin'], group: 'Administration' },
  { to: '/admin/organizations', label: 'Customer organizations', roles: ['admin'], group: 'Administration' },
  { to: '/admin/audit', label: 'Audit trail', roles: ['admin'], group: 'Administration' },
  { to: '/admin/mail', label: 'Mail', roles: ['admin'], group: 'Administration' },
]

export function navFor(role: Role): NavItem[] {
  return NAV_ITEMS.filter(item => item.roles.includes(role))
}

/** The roles allowed on a path, by the longest matching nav prefix; undefined = any signed-in user. */
export function rolesForPath(path: string): readonly Role[] | undefined {
  let best: NavItem | undefined
  for (const item of NAV_ITEMS) {
    if (item.to === '/') continue
    if ((path === item.to || path.startsWith(item.to + '/')) && (!best || item.to.length > best.to.length)) best = item
  }
  return best?.roles
}
