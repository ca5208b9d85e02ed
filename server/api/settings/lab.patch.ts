import { labSettingsUpdateSchema } from '../../../shared/schemas/certificate'
import type { LabSettingsDTO } from '../../../shared/types'
import { requireRole } from '../../utils/access'
import { labSettingsDTO, updateLabSettingsIn } from '../../utils/certificates'
import { inTransaction } from '../../utils/transaction'
import { parseWith } from '../../utils/validation'

/** Change the laboratory's settings (any subset, with the version last seen; 409 when stale). */
export default defineEventHandler(async (event): Promise<LabSettingsDTO> => {
  const user = await requireRole(event, 'admin')
  const input = await readValidatedBody(event, parseWith(labSettingsUpdateSchema))
  return labSettingsDTO(await inTransaction(t => updateLabSettingsIn(t, user, input)))
})
