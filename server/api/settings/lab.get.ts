import { LAB_ROLES } from '../../../shared/roles'
import type { LabSettingsDTO } from '../../../shared/types'
import { requireRole } from '../../utils/access'
import { labSettingsDTO, labSettingsRow } from '../../utils/certificates'

/** The laboratory's settings: name, address, accreditation, certificate numbering, signatory functions, statements. */
export default defineEventHandler(async (event): Promise<LabSettingsDTO> => {
  await requireRole(event, ...LAB_ROLES)
  return labSettingsDTO(await labSettingsRow())
})
