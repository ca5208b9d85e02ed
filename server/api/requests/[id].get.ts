import { idParamSchema } from '../../../shared/schemas/common'
import { requireRole } from '../../utils/access'
import { findRequest, requestDTO } from '../../utils/requests'
import { parseWith } from '../../utils/validation'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin', 'technician', 'quality', 'customer')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  return await requestDTO(await findRequest(user, id))
})
