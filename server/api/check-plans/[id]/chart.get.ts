import { idParamSchema } from '#shared/schemas/common'
import { controlChartQuerySchema } from '#shared/schemas/check'
import { checkChart } from '#server/services/checks/checks'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** The Shewhart individuals chart of the plan's results at one nominal value, with the run rules stated. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'check:read')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const q = await getValidatedQuery(event, parseWith(controlChartQuerySchema))
  return await checkChart(id, q)
})
