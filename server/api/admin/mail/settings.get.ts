import type { MailSettingsDTO } from '../../../../shared/types'
import { requireRole } from '../../../utils/access'
import { mailSettingsDTO, mailSettingsRow } from '../../../utils/reminders'

export default defineEventHandler(async (event): Promise<MailSettingsDTO> => {
  await requireRole(event, 'admin')
  return mailSettingsDTO(await mailSettingsRow())
})
