import { idParamSchema } from '../../../shared/schemas/common'
import { sourceUpdateSchema } from '../../../shared/schemas/source'
import { requireRole } from '../../utils/access'
import { SOURCE_REGISTER, updateEquipment } from '../../utils/registersEquipment'
import { parseWith } from '../../utils/validation'

/** Edit a blackbody source (409 when the version is stale; the merged record is re-checked). */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'quality', 'admin')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(sourceUpdateSchema))
  return await updateEquipment(SOURCE_REGISTER, user, id, input)
})
