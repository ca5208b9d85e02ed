import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import { sequelize } from '#server/utils/db'

/**
 * When and how reminders go out (one row, id 1, created by migration 0005): the lab-local hour
 * from which the hourly job sends, the lab's IANA time zone, the lead times in days before a
 * due date, and whether overdue instruments are reminded weekly. Changed by an administrator,
 * with a version.
 */
export class MailSettings extends Model<InferAttributes<MailSettings>, InferCreationAttributes<MailSettings>> {
  declare id: CreationOptional<number>
  declare sendHour: number
  declare timeZone: string
  declare leadTimes: number[]
  declare overdueWeekly: boolean
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

MailSettings.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    sendHour: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 6 },
    timeZone: { type: DataTypes.STRING(64), allowNull: false, defaultValue: 'Europe/London' },
    leadTimes: { type: DataTypes.JSON, allowNull: false, defaultValue: [60, 30, 7] },
    overdueWeekly: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'mail_settings', version: true },
)
