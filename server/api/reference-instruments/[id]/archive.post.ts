import { idParamSchema } from '../../../../shared/schemas/common'
import { archiveSchema } from '../../../../shared/schemas/registerQuery'
import { requireRole } from '../../../utils/access'
import { REFERENCE_REGISTER, archiveEquipment } from '../../../utils/registersEquipment'
import { parseWith } from '../../../utils/validation'

/** Archive or restore a reference instrument; records are never deleted. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'quality', 'admin')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(archiveSchema))
  return await archiveEquipment(REFERENCE_REGISTER, user, id, input)
})
