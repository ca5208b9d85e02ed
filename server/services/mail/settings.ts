/** When and how reminders go out: send hour and time zone of the laboratory, lead times, weekly overdue notices. */
import type { Transaction } from 'sequelize'
import type { MailSettingsUpdateInput } from '#shared/schemas/mail'
import type { MailSettingsDTO, SessionUser } from '#shared/types'
import { MailSettings } from '#server/models/MailSettings'
import { updateAudited } from '#server/utils/audit'
import { assertVersion } from '#server/utils/errors'
import { inTransaction } from '#server/utils/transaction'

/** The settings row (created by migration 0005; re-created with defaults if it went missing). */
export async function mailSettingsRow(transaction?: Transaction): Promise<MailSettings> {
  const row = await MailSettings.findOne({ order: [['id', 'ASC']], transaction })
  return row ?? MailSettings.create({ sendHour: 6, timeZone: 'Europe/London', leadTimes: [60, 30, 7], overdueWeekly: true }, { transaction })
}

export function mailSettingsDTO(row: MailSettings): MailSettingsDTO {
  return {
    sendHour: row.sendHour,
    timeZone: row.timeZone,
    leadTimes: [...row.leadTimes],
    overdueWeekly: !!row.overdueWeekly,
    version: row.version,
    updatedAt: row.updatedAt.toISOString(),
  }
}


/** Change when and how reminders go out. */
export async function updateMailSettings(actor: SessionUser, input: MailSettingsUpdateInput): Promise<MailSettingsDTO> {
  const row = await inTransaction(async (t) => {
    const row = await mailSettingsRow(t)
    assertVersion(row.version, input.version)
    const changes: Partial<MailSettings> = {}
    if (input.sendHour !== undefined) changes.sendHour = input.sendHour
    if (input.timeZone !== undefined) changes.timeZone = input.timeZone
    if (input.leadTimes !== undefined) changes.leadTimes = [...input.leadTimes].sort((a, b) => b - a)
    if (input.overdueWeekly !== undefined) changes.overdueWeekly = input.overdueWeekly
    await updateAudited(t, actor, row, changes, { entity: 'MailSettings' })
    return row
  })
  return mailSettingsDTO(row)
}
