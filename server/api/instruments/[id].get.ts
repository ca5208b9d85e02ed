import { idParamSchema } from '#shared/schemas/common'
import { instrumentDetail } from '#server/services/instruments/instruments'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** One instrument; a customer only its own organization's (404 otherwise), without the lab's notes or audit rows. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'instrument:read')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  return await instrumentDetail(user, id)
})
