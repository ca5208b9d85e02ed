import { idParamSchema } from '#shared/schemas/common'
import { nonconformityCloseSchema } from '#shared/schemas/nonconformity'
import { closeNonconformity } from '#server/services/nonconformities/nonconformities'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Close once every affected certificate has its decision and work has resumed (409 otherwise). */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'nonconformity:manage')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(nonconformityCloseSchema))
  return await closeNonconformity(user, id, input)
})
