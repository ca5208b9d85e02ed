import { LAB_ROLES } from '../../../shared/roles'
import { idParamSchema } from '../../../shared/schemas/common'
import type { InstrumentDetailDTO } from '../../../shared/types'
import { Instrument } from '../../models/Instrument'
import { SpectralResponse } from '../../models/SpectralResponse'
import { notFound, organizationScope, requireRole } from '../../utils/access'
import { spectralResponseDTO } from '../../utils/presentRegisters'
import { auditTrail } from '../../utils/registers'
import { instrumentDTOs, visibleTo } from '../../utils/registersInstruments'
import { parseWith } from '../../utils/validation'

/**
 * One instrument with its responsivity table and, for laboratory roles, its audit trail.
 * A customer gets only its own organization's instruments (another's answers 404), never audit rows
 * and never the laboratory's notes.
 */
export default defineEventHandler(async (event): Promise<InstrumentDetailDTO> => {
  const user = await requireRole(event, ...LAB_ROLES, 'customer')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const row = await Instrument.findOne({ where: { id, ...organizationScope(user) } })
  if (!row) notFound('instrument')
  const [dto] = await instrumentDTOs([row])
  const sr = row.spectralResponseId ? await SpectralResponse.findByPk(row.spectralResponseId) : null
  const detail: InstrumentDetailDTO = visibleTo({ ...dto!, spectralResponse: sr ? spectralResponseDTO(sr) : null }, user)
  if (user.role !== 'customer') detail.audit = await auditTrail('Instrument', id)
  return detail
})
