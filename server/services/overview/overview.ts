/**
 * The overview page's counts (GET /api/overview) in one SQL statement: instruments overdue and due
 * within 30 days, open calibration requests and — for laboratory roles — runs waiting for review and
 * runs in draft. Each count has the same conditions as the list it links to (so it equals that list's
 * `total`), and each is a range of an index: instruments by (archived, nextDueDate) — for a customer
 * (organizationId, archived, nextDueDate) — requests by (status, createdAt) or (organizationId, status),
 * runs by (status, calibrationDate). Due dates count from the laboratory's today in its own time zone.
 */
import { QueryTypes } from 'sequelize'
import { addDays } from '#shared/mail/milestones'
import { can } from '#shared/permissions'
import type { OverviewDTO, SessionUser } from '#shared/types'
import { sequelize } from '#server/utils/db'
import { labToday } from '#server/services/settings/today'

/** "Due soon" means due before today plus this many days (overdue included), as the page says. */
export const DUE_SOON_DAYS = 30

/** The counts the signed-in user's overview shows; null for a count the role may not see. */
export async function overviewCounts(user: SessionUser): Promise<OverviewDTO> {
  const today = await labToday()
  const dueSoonBefore = addDays(today, DUE_SOON_DAYS)
  const customer = user.role === 'customer'
  const org = customer ? ' AND "organizationId" = :org' : ''
  const instruments = can(user.role, 'instrument:read')
  const requests = can(user.role, 'request:read')
  const runs = can(user.role, 'run:read')
  const parts = [
    instruments ? `(SELECT count(*) FROM instruments WHERE archived = FALSE AND "nextDueDate" < :today${org})` : 'NULL',
    instruments ? `(SELECT count(*) FROM instruments WHERE archived = FALSE AND "nextDueDate" < :soon${org})` : 'NULL',
    requests ? `(SELECT count(*) FROM calibration_requests WHERE status = 'open'${org})` : 'NULL',
    runs ? `(SELECT count(*) FROM calibration_runs WHERE status = 'submitted')` : 'NULL',
    runs ? `(SELECT count(*) FROM calibration_runs WHERE status = 'draft')` : 'NULL',
  ]
  const row = await sequelize.query<Record<'overdue' | 'dueSoon' | 'openRequests' | 'toReview' | 'drafts', number | string | null>>(
    `SELECT ${parts[0]} AS overdue, ${parts[1]} AS "dueSoon", ${parts[2]} AS "openRequests", ${parts[3]} AS "toReview", ${parts[4]} AS drafts`,
    { type: QueryTypes.SELECT, plain: true, replacements: { today, soon: dueSoonBefore, org: user.organizationId ?? -1 } },
  )
  // PostgreSQL answers count(*) as a bigint, which pg gives as text
  const n = (v: number | string | null | undefined) => (v === null || v === undefined ? null : Number(v))
  return {
    today,
    dueSoonBefore,
    overdue: n(row?.overdue),
    dueSoon: n(row?.dueSoon),
    openRequests: n(row?.openRequests),
    toReview: n(row?.toReview),
    drafts: n(row?.drafts),
  }
}
