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

  /** Intermediate checks of the reference equipment: plans, results, control charts (6.4.10). */
  'check:read': LAB_ROLES,
  /** Record a check result (whoever performs the check). */
  'check:record': LAB_ROLES,
  /** Set up or change a check plan. */
  'check:plan': QUALITY_AND_ADMIN,
  /** Proficiency tests and interlaboratory comparisons (7.7.2). */
  'proficiency:read': LAB_ROLES,
  'proficiency:edit': QUALITY_AND_ADMIN,
  /** Which runs and certificates used a source or reference instrument in a period (6.4.9, 7.10). */
  'impact:read': QUALITY_AND_ADMIN,
  /** Nonconforming work (7.10): anyone in the laboratory can raise one; the quality manager handles it. */
  'nonconformity:read': LAB_ROLES,
  'nonconformity:raise': LAB_ROLES,
  /** Withhold, decide per certificate, notify customers, authorise resuming work, close. */
  'nonconformity:manage': QUALITY_AND_ADMIN,
  /** Complaints (7.9): customers see and submit their own organization's in the portal. */
  'complaint:read': ROLES,
  'complaint:submit': ROLES,
  /** Investigate a complaint and propose its outcome. */
  'complaint:handle': QUALITY_AND_ADMIN,
  /** Approve the outcome and close (never someone involved in the work complained about). */
  'complaint:approve': QUALITY_AND_ADMIN,
  /** Corrective actions (8.7). */
  'action:read': LAB_ROLES,
  /** Mark one's own action done (the quality manager may mark any). */
  'action:work': LAB_ROLES,
  'action:manage': QUALITY_AND_ADMIN,
  /** Calibration-interval analysis from the as-found history (the laboratory only, never customers). */
  'interval:read': LAB_ROLES,
  /** Record an interval decision for the laboratory's own equipment. */
  'interval:decide': QUALITY_AND_ADMIN,
  /** The quality manager's overview and the management-review summary (8.9). */
  'quality:overview': QUALITY_AND_ADMIN,

  /**
   * Billing (quotes, orders, invoices). Customers see their own organization's (404 otherwise) and
   * never a draft quote; the administrator keeps the books — one permission, so a lab that wants an
   * office role grants it here.
   */
  'quote:read': ['admin', 'customer'],
  /** Accept a quote with a purchase-order number (which makes the order), or decline it. */
  'quote:respond': ['customer'],
  /** Orders and where they stand (the laboratory's staff follow them too). */
  'order:read': ROLES,
  /** Record the return of an order's instruments, with the carrier's tracking reference. */
  'order:ship': LAB_ROLES,
  'invoice:read': ['admin', 'customer'],
  /** Pay an invoice by card through the hosted checkout. */
  'invoice:pay': ['customer'],
  /** Prices, quotes, invoices by hand, credit notes, bank transfers, the accounting export. */
  'billing:manage': ['admin'],

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
