import { labSettings } from '#server/services/settings/labSettings'
import { requirePermission } from '#server/utils/access'

/** The laboratory's settings: name, address, accreditation, certificate numbering, signatory functions, statements. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'settings:read')
  return await labSettings()
})
