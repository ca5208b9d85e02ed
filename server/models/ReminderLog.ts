import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import { sequelize } from '#server/utils/db'

/** What a reminder log row is about: a customer instrument, the lab's own source or reference instrument, an action of a corrective action, or an overdue invoice. */
export type ReminderItemType = 'instrument' | 'source' | 'reference' | 'action' | 'invoice'

/**
 * One milestone of one due date that has been reminded about (shared/mail/milestones.ts):
 * (itemType, itemId, dueDate, milestone) is unique, and the row is written in the same
 * transaction as the outbox message that carries it. So a milestone is sent once, by one
 * instance, and a milestone reached but not logged is sent by the next run. A new due date
 * (after recalibration) starts a fresh set of milestones. Never changed.
 */
export class ReminderLog extends Model<InferAttributes<ReminderLog>, InferCreationAttributes<ReminderLog>> {
  declare id: CreationOptional<number>
  declare itemType: ReminderItemType
  declare itemId: number
  declare dueDate: string
  declare milestone: string
  /** Lab-local date of the run that sent it. */
  declare sentOn: string
  declare outboxMessageId: number | null
  declare createdAt: CreationOptional<Date>
}

ReminderLog.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    itemType: { type: DataTypes.STRING(20), allowNull: false },
    itemId: { type: DataTypes.INTEGER, allowNull: false },
    dueDate: { type: DataTypes.DATEONLY, allowNull: false },
    milestone: { type: DataTypes.STRING(40), allowNull: false },
    sentOn: { type: DataTypes.DATEONLY, allowNull: false },
    outboxMessageId: { type: DataTypes.INTEGER, allowNull: true },
    createdAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'reminder_logs', updatedAt: false },
)
