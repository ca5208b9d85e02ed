import { mailSettingsUpdateSchema } from '../../../../shared/schemas/mail'
import type { MailSettingsDTO } from '../../../../shared/types'
import { requireRole } from '../../../utils/access'
import { recordAudit, snapshot } from '../../../utils/audit'
import { mailSettingsDTO, mailSettingsRow } from '../../../utils/reminders'
import { assertVersion, inTransaction } from '../../../utils/transaction'
import { parseWith } from '../../../utils/validation'

/** Change when and how reminders go out (send hour, time zone, lead times, weekly overdue reminders). */
export default defineEventHandler(async (event): Promise<MailSettingsDTO> => {
  const admin = await requireRole(event, 'admin')
  const input = await readValidatedBody(event, parseWith(mailSettingsUpdateSchema))
  const row = await inTransaction(async (t) => {
    const row = await mailSettingsRow(t)
    assertVersion(row.version, input.version)
    const before = snapshot(row)
    if (input.sendHour !== undefined) row.sendHour = input.sendHour
    if (input.timeZone !== undefined) row.timeZone = input.timeZone
    if (input.leadTimes !== undefined) row.leadTimes = [...input.leadTimes].sort((a, b) => b - a)
    if (input.overdueWeekly !== undefined) row.overdueWeekly = input.overdueWeekly
    if (!row.changed()) return row
    await row.save({ transaction: t })
    await recordAudit(t, { userId: admin.id, action: 'update', entity: 'MailSettings', entityId: row.id, before, after: snapshot(row) })
    return row
  })
  return mailSettingsDTO(row)
})
