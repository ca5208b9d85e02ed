import { labSettingsUpdateSchema } from '#shared/schemas/certificate'
import { updateLabSettings } from '#server/services/settings/labSettings'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Change the laboratory's settings (any subset, with the version last seen; 409 when stale). */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'settings:edit')
  const input = await readValidatedBody(event, parseWith(labSettingsUpdateSchema))
  return await updateLabSettings(user, input)
})
