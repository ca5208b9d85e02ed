/**
 * The four roles of Bandlight. One list, used by schemas, the server's access
 * checks and the navigation.
 */
export const ROLES = ['admin', 'technician', 'quality', 'customer'] as const
export type Role = (typeof ROLES)[number]

/** Roles that work inside the laboratory (everyone but the customer). */
export const LAB_ROLES = ['admin', 'technician', 'quality'] as const satisfies readonly Role[]

export const ROLE_LABELS: Record<Role, string> = {
  admin: 'Administrator',
  technician: 'Technician',
  quality: 'Quality manager',
  customer: 'Customer',
}
