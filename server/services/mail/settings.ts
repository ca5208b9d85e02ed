/**
 * When and how reminders go out: the send hour (in the laboratory's time zone, which belongs to the
 * lab settings), lead times and weekly overdue notices. The `time_zone` column of the mail settings
 * is no longer used: the lab's time zone is one value, shown and changed here and on the lab page.
 */
import type { Transaction } from 'sequelize'
import type { MailSettingsUpdateInput } from '#shared/schemas/mail'
import type { MailSettingsDTO, SessionUser } from '#shared/types'
import { LabSettings } from '#server/models/LabSettings'
import { MailSettings } from '#server/models/MailSettings'
import { updateAudited } from '#server/utils/audit'
import { assertVersion, conflict } from '#server/utils/errors'
import { inTransaction } from '#server/utils/transaction'
import { forgetLabTimeZone, labTimeZone } from '#server/services/settings/today'

/** The settings row (created by migration 0005; re-created with defaults if it went missing). */
export async function mailSettingsRow(transaction?: Transaction): Promise<MailSettings> {
  const row = await MailSettings.findOne({ order: [['id', 'ASC']], transaction })
  return row ?? MailSettings.create({ sendHour: 6, timeZone: 'Europe/London', leadTimes: [60, 30, 7], overdueWeekly: true }, { transaction })
}

export function mailSettingsDTO(row: MailSettings, timeZone: string): MailSettingsDTO {
  return {
    sendHour: row.sendHour,
    timeZone,
    leadTimes: [...row.leadTimes],
    overdueWeekly: !!row.overdueWeekly,
    version: row.version,
    updatedAt: row.updatedAt.toISOString(),
  }
}

export async function mailSettings(): Promise<MailSettingsDTO> {
  return mailSettingsDTO(await mailSettingsRow(), await labTimeZone())
}

/** Change when and how reminders go out; a new time zone is the laboratory's (audited on its settings). */
export async function updateMailSettings(actor: SessionUser, input: MailSettingsUpdateInput): Promise<MailSettingsDTO> {
  const row = await inTransaction(async (t) => {
    const row = await mailSettingsRow(t)
    assertVersion(row.version, input.version)
    const changes: Partial<MailSettings> = {}
    if (input.sendHour !== undefined) changes.sendHour = input.sendHour
    if (input.leadTimes !== undefined) changes.leadTimes = [...input.leadTimes].sort((a, b) => b - a)
    if (input.overdueWeekly !== undefined) changes.overdueWeekly = input.overdueWeekly
    await updateAudited(t, actor, row, changes, { entity: 'MailSettings' })
    if (input.timeZone !== undefined) {
      const lab = await LabSettings.findOne({ order: [['id', 'ASC']], transaction: t })
      if (!lab) conflict('Enter the laboratory settings first: the time zone is the laboratory\'s', 'timeZone')
      await updateAudited(t, actor, lab, { timeZone: input.timeZone }, { entity: 'LabSettings' })
    }
    return row
  })
  forgetLabTimeZone()
  return mailSettingsDTO(row, await labTimeZone())
}
