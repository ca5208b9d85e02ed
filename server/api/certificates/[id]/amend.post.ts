import { idParamSchema } from '#shared/schemas/common'
import { certificateAmendSchema } from '#shared/schemas/certificate'
import { amendCertificate } from '#server/services/certificates/issue'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Issue a new revision of the same number (`-R1` …) with the reason; the earlier one becomes superseded. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'certificate:sign')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(certificateAmendSchema))
  const cert = await amendCertificate(event, user, id, input)
  setResponseStatus(event, 201)
  return cert
})
