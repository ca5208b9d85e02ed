import { idParamSchema } from '../../../../shared/schemas/common'
import { archiveSchema } from '../../../../shared/schemas/registerQuery'
import { requireRole } from '../../../utils/access'
import { SOURCE_REGISTER, archiveEquipment } from '../../../utils/registersEquipment'
import { parseWith } from '../../../utils/validation'

/** Archive or restore a blackbody source; records are never deleted. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'quality', 'admin')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(archiveSchema))
  return await archiveEquipment(SOURCE_REGISTER, user, id, input)
})
