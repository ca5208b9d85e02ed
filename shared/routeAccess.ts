/**
 * The route matrix: every API route and the permission it requires (or `open` for the few routes
 * that answer without a session). With the policy in ./permissions.ts it says, for every route and
 * every role, what the server must answer: 403 for a role without the permission, 401 for anyone
 * without a session on a closed route. The access test (tests/api/access.test.ts) enumerates the
 * route files and checks each against this table; a route missing here fails the test.
 * Keys are `METHOD path` with path parameters as in the file names (`[id]`).
 */
import type { Permission } from './permissions'

export const ROUTE_ACCESS = {
  'POST /api/auth/login': 'open',
  'POST /api/auth/logout': 'account:self',
  'GET /api/auth/me': 'account:self',
  'GET /api/health': 'open',
  'GET /api/verify': 'open',
  'POST /api/verify/file': 'open',
  'GET /api/mail/unsubscribe': 'open',

  'POST /api/calculations/band-radiance': 'calculation:run',
  'POST /api/calculations/temperature': 'calculation:run',
  'POST /api/calculations/expected-reading': 'calculation:run',
  'POST /api/calculations/ratio-reading': 'calculation:run',
  'POST /api/calculations/calibration-equation': 'calculation:run',
  'POST /api/calculations/budget': 'calculation:run',
  'POST /api/calculations/conformity': 'calculation:run',
  'POST /api/calculations/monte-carlo': 'calculation:run',
  'POST /api/calculations/monte-carlo/jobs': 'calculation:run',
  'GET /api/calculations/monte-carlo/jobs/[id]': 'calculation:run',

  'GET /api/instruments': 'instrument:read',
  'POST /api/instruments': 'instrument:edit',
  'GET /api/instruments/export': 'instrument:export',
  'POST /api/instruments/import': 'instrument:edit',
  'GET /api/instruments/[id]': 'instrument:read',
  'PATCH /api/instruments/[id]': 'instrument:edit',
  'POST /api/instruments/[id]/archive': 'instrument:edit',
  'GET /api/instruments/[id]/history': 'instrument:read',

  'GET /api/customers': 'customer:read',
  'POST /api/customers': 'customer:edit',
  'GET /api/customers/export': 'customer:read',
  'POST /api/customers/import': 'customer:edit',
  'GET /api/customers/[id]': 'customer:read',
  'PATCH /api/customers/[id]': 'customer:edit',
  'POST /api/customers/[id]/contacts': 'customer:edit',
  'PATCH /api/contacts/[id]': 'customer:edit',

  'GET /api/responsivities': 'responsivity:read',
  'POST /api/responsivities': 'responsivity:edit',
  'GET /api/responsivities/[id]': 'responsivity:read',

  'GET /api/sources': 'equipment:read',
  'POST /api/sources': 'equipment:edit',
  'GET /api/sources/export': 'equipment:read',
  'POST /api/sources/import': 'equipment:edit',
  'GET /api/sources/[id]': 'equipment:read',
  'PATCH /api/sources/[id]': 'equipment:edit',
  'POST /api/sources/[id]/archive': 'equipment:edit',
  'POST /api/sources/[id]/calibrations': 'equipment:edit',
  'POST /api/sources/[id]/calibrations/dcc': 'equipment:edit',
  'GET /api/sources/[id]/correction': 'equipment:read',
  'GET /api/reference-instruments': 'equipment:read',
  'POST /api/reference-instruments': 'equipment:edit',
  'GET /api/reference-instruments/export': 'equipment:read',
  'POST /api/reference-instruments/import': 'equipment:edit',
  'GET /api/reference-instruments/[id]': 'equipment:read',
  'PATCH /api/reference-instruments/[id]': 'equipment:edit',
  'POST /api/reference-instruments/[id]/archive': 'equipment:edit',
  'POST /api/reference-instruments/[id]/calibrations': 'equipment:edit',
  'POST /api/reference-instruments/[id]/calibrations/dcc': 'equipment:edit',

  'GET /api/uploads/[id]': 'upload:read',
  'POST /api/uploads': 'upload:create',

  'GET /api/procedures': 'procedure:read',
  'POST /api/procedures': 'procedure:edit',
  'GET /api/procedures/[id]': 'procedure:read',
  'PATCH /api/procedures/[id]': 'procedure:edit',

  'GET /api/runs': 'run:read',
  'POST /api/runs': 'run:edit',
  'GET /api/runs/[id]': 'run:read',
  'PATCH /api/runs/[id]': 'run:edit',
  'POST /api/runs/[id]/points': 'run:edit',
  'POST /api/runs/[id]/points/import': 'run:edit',
  'PATCH /api/runs/[id]/points/[pointId]': 'run:edit',
  'POST /api/runs/[id]/points/[pointId]/monte-carlo': 'run:edit',
  'POST /api/runs/[id]/submit': 'run:edit',
  'POST /api/runs/[id]/void': 'run:edit',
  'POST /api/runs/[id]/receipt': 'run:edit',
  'POST /api/runs/[id]/points/[pointId]/void': 'run:edit',
  'GET /api/runs/[id]/certificate-preview': 'run:read',
  'POST /api/runs/[id]/return': 'run:review',
  'POST /api/runs/[id]/approve': 'run:review',

  'GET /api/requests': 'request:read',
  'POST /api/requests': 'request:create',
  'GET /api/requests/[id]': 'request:read',
  'POST /api/requests/[id]/review': 'request:handle',
  'POST /api/requests/[id]/agree': 'request:agree',
  'POST /api/requests/[id]/record-agreement': 'request:handle',
  'POST /api/requests/[id]/accept': 'request:handle',
  'POST /api/requests/[id]/decline': 'request:handle',

  'GET /api/certificates': 'certificate:read',
  'POST /api/certificates': 'certificate:sign',
  'GET /api/certificates/[id]': 'certificate:read',
  'GET /api/certificates/[id]/pdf': 'certificate:read',
  'GET /api/certificates/[id]/dcc': 'certificate:read',
  'POST /api/certificates/[id]/amend': 'certificate:sign',
  'POST /api/certificates/[id]/withdraw': 'certificate:sign',
  'POST /api/certificates/[id]/reopen': 'certificate:reopen',

  'GET /api/sources/[id]/impact': 'impact:read',
  'GET /api/reference-instruments/[id]/impact': 'impact:read',
  'GET /api/sources/[id]/interval-review': 'interval:read',
  'POST /api/sources/[id]/interval-decisions': 'interval:decide',
  'GET /api/reference-instruments/[id]/interval-review': 'interval:read',
  'POST /api/reference-instruments/[id]/interval-decisions': 'interval:decide',
  'GET /api/instruments/[id]/interval-review': 'interval:read',

  'GET /api/check-plans': 'check:read',
  'POST /api/check-plans': 'check:plan',
  'GET /api/check-plans/[id]': 'check:read',
  'PATCH /api/check-plans/[id]': 'check:plan',
  'POST /api/check-plans/[id]/results': 'check:record',
  'GET /api/check-plans/[id]/chart': 'check:read',
  'GET /api/check-results': 'check:read',

  'GET /api/proficiency-results': 'proficiency:read',
  'POST /api/proficiency-results': 'proficiency:edit',
  'GET /api/proficiency-results/[id]': 'proficiency:read',

  'GET /api/nonconformities': 'nonconformity:read',
  'POST /api/nonconformities': 'nonconformity:raise',
  'GET /api/nonconformities/[id]': 'nonconformity:read',
  'PATCH /api/nonconformities/[id]': 'nonconformity:manage',
  'POST /api/nonconformities/[id]/decisions': 'nonconformity:manage',
  'POST /api/nonconformities/[id]/notify': 'nonconformity:manage',
  'POST /api/nonconformities/[id]/resume': 'nonconformity:manage',
  'POST /api/nonconformities/[id]/close': 'nonconformity:manage',

  'GET /api/complaints': 'complaint:read',
  'POST /api/complaints': 'complaint:submit',
  'GET /api/complaints/[id]': 'complaint:read',
  'PATCH /api/complaints/[id]': 'complaint:handle',
  'POST /api/complaints/[id]/outcome': 'complaint:handle',
  'POST /api/complaints/[id]/approve': 'complaint:approve',

  'GET /api/corrective-actions': 'action:read',
  'POST /api/corrective-actions': 'action:manage',
  'GET /api/corrective-actions/[id]': 'action:read',
  'PATCH /api/corrective-actions/[id]': 'action:manage',
  'POST /api/corrective-actions/[id]/items': 'action:manage',
  'POST /api/corrective-actions/[id]/items/[itemId]/done': 'action:work',
  'POST /api/corrective-actions/[id]/effectiveness': 'action:manage',
  'POST /api/corrective-actions/[id]/close': 'action:manage',

  'GET /api/quality/overview': 'quality:overview',
  'GET /api/quality/management-review': 'quality:overview',
  'GET /api/quality/management-review/pdf': 'quality:overview',

  'GET /api/settings/lab': 'settings:read',
  'GET /api/settings/today': 'account:self',
  'GET /api/overview': 'account:self',
  'PATCH /api/settings/lab': 'settings:edit',

  'GET /api/staff': 'run:read',
  'GET /api/admin/users': 'user:manage',
  'POST /api/admin/users': 'user:manage',
  'PATCH /api/admin/users/[id]': 'user:manage',
  'POST /api/admin/users/[id]/active': 'user:manage',
  'POST /api/admin/users/[id]/password': 'user:manage',
  'GET /api/admin/organizations': 'organization:manage',
  'POST /api/admin/organizations': 'organization:manage',
  'PATCH /api/admin/organizations/[id]': 'organization:manage',
  'GET /api/admin/audit': 'audit:read',
  'GET /api/admin/mail/outbox': 'mail:manage',
  'POST /api/admin/mail/outbox/[id]/requeue': 'mail:manage',
  'GET /api/admin/mail/received': 'mail:manage',
  'GET /api/admin/mail/settings': 'mail:manage',
  'PATCH /api/admin/mail/settings': 'mail:manage',
  'GET /api/admin/mail/reminders/preview': 'mail:manage',
  'POST /api/admin/mail/reminders/run': 'mail:manage',
} as const satisfies Record<string, Permission | 'open'>

export type RouteKey = keyof typeof ROUTE_ACCESS

/** The paths of the routes that answer without a session (the session middleware lets them through). */
export const OPEN_API_PATHS: readonly string[] = Object.entries(ROUTE_ACCESS)
  .filter(([, p]) => p === 'open')
  .map(([k]) => k.split(' ')[1]!)
