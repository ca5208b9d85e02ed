import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import type { MailKind, OutboxStatus } from '#shared/schemas/mail'
import { sequelize } from '#server/utils/db'

/** A file sent with a message: its name, type and the SHA-256 under which the file store keeps it. */
export interface MailAttachment {
  filename: string
  contentType: string
  sha256: string
}

/**
 * One e-mail, written before it is sent (server/utils/outbox.ts delivers it). `dedupeKey` is
 * unique: the same message cannot be queued twice, whichever server instance tries. A sender
 * claims a row (claimedBy / claimedUntil) before sending it, so two instances never send one
 * row twice; a failure records attempts, lastError and the back-off in nextAttemptAt.
 * Rows are kept: status moves queued → sent, or queued → failed after the last attempt.
 */
export class OutboxMessage extends Model<InferAttributes<OutboxMessage>, InferCreationAttributes<OutboxMessage>> {
  declare id: CreationOptional<number>
  declare kind: MailKind
  declare recipients: string[]
  declare subject: string
  declare text: string
  declare html: string | null
  declare dedupeKey: string
  declare status: CreationOptional<OutboxStatus>
  declare attempts: CreationOptional<number>
  declare lastError: CreationOptional<string | null>
  declare nextAttemptAt: CreationOptional<Date | null>
  declare sentAt: CreationOptional<Date | null>
  declare claimedBy: CreationOptional<string | null>
  declare claimedUntil: CreationOptional<Date | null>
  /** Files sent with the message (stored files, by SHA-256), or null. */
  declare attachments: CreationOptional<MailAttachment[] | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

OutboxMessage.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    kind: { type: DataTypes.STRING(40), allowNull: false },
    recipients: { type: DataTypes.JSON, allowNull: false },
    subject: { type: DataTypes.STRING(300), allowNull: false },
    text: { type: DataTypes.TEXT, allowNull: false },
    html: { type: DataTypes.TEXT, allowNull: true },
    dedupeKey: { type: DataTypes.STRING(200), allowNull: false, unique: true },
    status: { type: DataTypes.STRING(12), allowNull: false, defaultValue: 'queued' },
    attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    lastError: { type: DataTypes.TEXT, allowNull: true },
    nextAttemptAt: { type: DataTypes.DATE, allowNull: true },
    sentAt: { type: DataTypes.DATE, allowNull: true },
    claimedBy: { type: DataTypes.STRING(80), allowNull: true },
    claimedUntil: { type: DataTypes.DATE, allowNull: true },
    attachments: { type: DataTypes.JSON, allowNull: true },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'outbox_messages' },
)
