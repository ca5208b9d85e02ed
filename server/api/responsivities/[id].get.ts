import { LAB_ROLES } from '../../../shared/roles'
import { idParamSchema } from '../../../shared/schemas/common'
import { SpectralResponse } from '../../models/SpectralResponse'
import { notFound, requireRole } from '../../utils/access'
import { spectralResponseDTO } from '../../utils/presentRegisters'
import { parseWith } from '../../utils/validation'

/** One responsivity table with its normalized points. */
export default defineEventHandler(async (event) => {
  await requireRole(event, ...LAB_ROLES)
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const row = await SpectralResponse.findByPk(id)
  if (!row) notFound('responsivity table')
  return spectralResponseDTO(row)
})
