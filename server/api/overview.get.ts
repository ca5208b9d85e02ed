import { overviewCounts } from '#server/services/overview/overview'
import { requirePermission } from '#server/utils/access'

/** The overview page's counts in one query (instruments overdue and due soon, open requests, runs to review and in draft). */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'account:self')
  return await overviewCounts(user)
})
