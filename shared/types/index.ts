import type { Role } from '../roles'

/** What the session and GET /api/auth/me carry about the signed-in user. */
export interface SessionUser {
  id: number
  name: string
  email: string
  role: Role
  organizationId: number | null
}

/** A member of the laboratory's staff, as lab roles see them (GET /api/staff). */
export interface StaffMemberDTO {
  id: number
  name: string
  role: Role
}

/** A user as the administration API returns it (never the password hash). */
export interface UserDTO extends SessionUser {
  active: boolean
  version: number
  createdAt: string
  updatedAt: string
  organizationName: string | null
}

export interface OrganizationDTO {
  id: number
  name: string
  contactEmails: string[]
  active: boolean
  version: number
  createdAt: string
  updatedAt: string
}

export interface AuditEventDTO {
  id: number
  at: string
  userId: number | null
  userName: string | null
  action: string
  entity: string
  entityId: number | null
  before: unknown
  after: unknown
}

export interface Page<T> {
  rows: T[]
  total: number
  page: number
  pageSize: number
}

/** Body of every 4xx answer from a validated route: `data.fields` names each field at fault. */
export interface FieldErrors {
  [field: string]: string
}

export type * from './registers'
export type * from './runs'
export type * from './certificates'
export type * from './requests'
export type * from './mail'
export type * from './quality'

/**
 * GET /api/overview: what needs attention, counted with the same conditions as the lists the tiles
 * link to (a count is null when the role may not see that list). Dates are the laboratory's, YYYY-MM-DD.
 */
export interface OverviewDTO {
  /** The laboratory's today; `overdue` counts instruments due before it. */
  today: string
  /** Today plus 30 days; `dueSoon` counts instruments due before it (overdue ones included). */
  dueSoonBefore: string
  overdue: number | null
  dueSoon: number | null
  openRequests: number | null
  toReview: number | null
  drafts: number | null
}
