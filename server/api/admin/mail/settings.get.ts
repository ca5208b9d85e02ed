import { mailSettingsDTO, mailSettingsRow } from '#server/services/mail/settings'
import { requirePermission } from '#server/utils/access'

export default defineEventHandler(async (event) => {
  await requirePermission(event, 'mail:manage')
  return mailSettingsDTO(await mailSettingsRow())
})
