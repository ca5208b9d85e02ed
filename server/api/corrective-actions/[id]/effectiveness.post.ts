import { idParamSchema } from '#shared/schemas/common'
import { effectivenessSchema } from '#shared/schemas/correctiveAction'
import { recordEffectiveness } from '#server/services/correctiveActions/correctiveActions'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Record the effectiveness check once every action is done (409 before). */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'action:manage')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(effectivenessSchema))
  return await recordEffectiveness(user, id, input)
})
