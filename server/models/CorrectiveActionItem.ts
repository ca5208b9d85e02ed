import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import { sequelize } from '#server/utils/db'

/**
 * One action of a corrective action: what is to be done, by whom (`ownerId`), by when (`dueDate`),
 * and when it was done, by whom, with a note. Overdue when not done after its due date (the
 * quality manager's overview and the daily mail list it).
 */
export class CorrectiveActionItem extends Model<InferAttributes<CorrectiveActionItem>, InferCreationAttributes<CorrectiveActionItem>> {
  declare id: CreationOptional<number>
  declare correctiveActionId: number
  declare description: string
  declare ownerId: number
  declare dueDate: string
  declare doneOn: string | null
  declare doneBy: number | null
  declare doneNote: string | null
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

CorrectiveActionItem.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    correctiveActionId: { type: DataTypes.INTEGER, allowNull: false },
    description: { type: DataTypes.TEXT, allowNull: false },
    ownerId: { type: DataTypes.INTEGER, allowNull: false },
    dueDate: { type: DataTypes.DATEONLY, allowNull: false },
    doneOn: { type: DataTypes.DATEONLY, allowNull: true },
    doneBy: { type: DataTypes.INTEGER, allowNull: true },
    doneNote: { type: DataTypes.TEXT, allowNull: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'corrective_action_items', version: true },
)
