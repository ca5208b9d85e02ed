import { idParamSchema } from '#shared/schemas/common'
import { correctiveActionUpdateSchema } from '#shared/schemas/correctiveAction'
import { updateCorrectiveAction } from '#server/services/correctiveActions/correctiveActions'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Title, cause and when effectiveness is to be checked, with the version last seen. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'action:manage')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(correctiveActionUpdateSchema))
  return await updateCorrectiveAction(user, id, input)
})
