import { idParamSchema } from '#shared/schemas/common'
import { nonconformityUpdateSchema } from '#shared/schemas/nonconformity'
import { updateNonconformity } from '#server/services/nonconformities/nonconformities'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Description, risk, the withhold switch and the corrections found, with the version last seen. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'nonconformity:manage')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(nonconformityUpdateSchema))
  return await updateNonconformity(user, id, input)
})
