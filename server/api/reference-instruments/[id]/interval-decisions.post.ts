import { idParamSchema } from '#shared/schemas/common'
import { intervalDecisionSchema } from '#shared/schemas/interval'
import { recordIntervalDecision } from '#server/services/intervals/intervals'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Record the interval decided, with the method, the reason and the analysis it was based on (audited). */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'interval:decide')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(intervalDecisionSchema))
  const review = await recordIntervalDecision(user, 'reference', id, input)
  setResponseStatus(event, 201)
  return review
})
