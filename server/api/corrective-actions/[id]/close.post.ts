import { idParamSchema } from '#shared/schemas/common'
import { correctiveActionCloseSchema } from '#shared/schemas/correctiveAction'
import { closeCorrectiveAction } from '#server/services/correctiveActions/correctiveActions'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Close: 409 until the effectiveness check is recorded and found the action effective. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'action:manage')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(correctiveActionCloseSchema))
  return await closeCorrectiveAction(user, id, input)
})
