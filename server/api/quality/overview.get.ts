import { qualityOverview } from '#server/services/quality/overview'
import { requirePermission } from '#server/utils/access'

/** The quality manager's overview: open nonconformities, checks due and overdue, failed checks, open complaints, overdue actions, proficiency results. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'quality:overview')
  return await qualityOverview()
})
