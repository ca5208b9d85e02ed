import { dropColumns } from './lib'
import { DataTypes, type QueryInterface } from 'sequelize'

/**
 * The laboratory's time zone belongs to the laboratory: one "today" for past-due flags, reminders
 * and form defaults. Moved from the mail settings (whose column stays, unused) to the lab settings.
 */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.addColumn('lab_settings', 'timeZone', { type: DataTypes.STRING(64), allowNull: false, defaultValue: 'Europe/London' })
  const [rows] = await qi.sequelize.query('SELECT "timeZone" FROM mail_settings ORDER BY id LIMIT 1')
  const tz = (rows as { timeZone?: string }[])[0]?.timeZone
  if (tz) await qi.sequelize.query('UPDATE lab_settings SET "timeZone" = :tz', { replacements: { tz } })
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await dropColumns(qi, 'lab_settings', ['timeZone'])
}
