import { idParamSchema } from '#shared/schemas/common'
import { receiptSchema } from '#shared/schemas/run'
import { recordReceipt } from '#server/services/runs/runs'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Record the receipt of the run's item (or correct it, with its version): date, packaging, condition, accessories, deviations. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'run:edit')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(receiptSchema))
  return await recordReceipt(user, id, input)
})
