import { idParamSchema } from '#shared/schemas/common'
import { actionItemCreateSchema } from '#shared/schemas/correctiveAction'
import { addActionItem } from '#server/services/correctiveActions/correctiveActions'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** A further action (owner, due date); an effectiveness check already recorded no longer stands. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'action:manage')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(actionItemCreateSchema))
  const action = await addActionItem(user, id, input)
  setResponseStatus(event, 201)
  return action
})
