import { idParamSchema } from '#shared/schemas/common'
import { certificateWithdrawSchema } from '#shared/schemas/certificate'
import { withdrawCertificate } from '#server/services/certificates/issue'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Withdraw the valid revision of a certificate, with the reason; it stays on record as withdrawn. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'certificate:sign')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(certificateWithdrawSchema))
  return await withdrawCertificate(event, user, id, input)
})
