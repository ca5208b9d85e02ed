import { idParamSchema } from '#shared/schemas/common'
import { requestRecordAgreementSchema } from '#shared/schemas/request'
import { recordAgreement } from '#server/services/requests/requests'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** The laboratory records how the customer agreed to the offered terms (telephone, e-mail, purchase order …). */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'request:handle')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(requestRecordAgreementSchema))
  return await recordAgreement(user, id, input)
})
