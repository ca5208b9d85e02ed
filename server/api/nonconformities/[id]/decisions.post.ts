import { idParamSchema } from '#shared/schemas/common'
import { nonconformityDecisionSchema } from '#shared/schemas/nonconformity'
import { decideOnCertificate } from '#server/services/nonconformities/nonconformities'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** The decision for one affected certificate: keep (with the reason), amend (reopen) or withdraw (password again). */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'nonconformity:manage')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(nonconformityDecisionSchema))
  const nc = await decideOnCertificate(event, user, id, input)
  setResponseStatus(event, 201)
  return nc
})
