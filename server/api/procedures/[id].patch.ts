import { idParamSchema } from '#shared/schemas/common'
import { procedureUpdateSchema } from '#shared/schemas/procedure'
import { updateProcedure } from '#server/services/procedures/procedures'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Edit a procedure: writes a new version (runs keep theirs); 409 when `version` is stale. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'procedure:edit')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(procedureUpdateSchema))
  return await updateProcedure(user, id, input)
})
