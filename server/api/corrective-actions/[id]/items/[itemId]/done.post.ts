import { idParamSchema } from '#shared/schemas/common'
import { actionItemDoneSchema } from '#shared/schemas/correctiveAction'
import { markActionItemDone } from '#server/services/correctiveActions/correctiveActions'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

const params = idParamSchema.extend({ itemId: idParamSchema.shape.id })

/** Mark one action done: its owner, a quality manager or an administrator (403 otherwise). */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'action:work')
  const { id, itemId } = await getValidatedRouterParams(event, parseWith(params))
  const input = await readValidatedBody(event, parseWith(actionItemDoneSchema))
  return await markActionItemDone(user, id, itemId, input)
})
