import { DataTypes, type QueryInterface } from 'sequelize'

/**
 * Mail: the outbox (every message is a row before it is sent), the reminder log (which
 * milestone of which due date has been reminded about, unique) and the mail settings row.
 */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.createTable('outbox_messages', {
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
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  })
  await qi.addIndex('outbox_messages', ['status', 'nextAttemptAt'], { name: 'outbox_messages_due' })
  await qi.addIndex('outbox_messages', ['createdAt'], { name: 'outbox_messages_created' })

  await qi.createTable('reminder_logs', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    itemType: { type: DataTypes.STRING(20), allowNull: false },
    itemId: { type: DataTypes.INTEGER, allowNull: false },
    dueDate: { type: DataTypes.DATEONLY, allowNull: false },
    milestone: { type: DataTypes.STRING(40), allowNull: false },
    sentOn: { type: DataTypes.DATEONLY, allowNull: false },
    outboxMessageId: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'outbox_messages', key: 'id' }, onDelete: 'RESTRICT' },
    createdAt: { type: DataTypes.DATE, allowNull: false },
  })
  await qi.addIndex('reminder_logs', ['itemType', 'itemId', 'dueDate', 'milestone'], { unique: true, name: 'reminder_logs_milestone_unique' })

  await qi.createTable('mail_settings', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    sendHour: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 6 },
    timeZone: { type: DataTypes.STRING(64), allowNull: false, defaultValue: 'Europe/London' },
    leadTimes: { type: DataTypes.JSON, allowNull: false },
    overdueWeekly: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  })
  const now = new Date()
  await qi.bulkInsert('mail_settings', [{ id: 1, sendHour: 6, timeZone: 'Europe/London', leadTimes: JSON.stringify([60, 30, 7]), overdueWeekly: true, version: 0, createdAt: now, updatedAt: now }])
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.dropTable('mail_settings')
  await qi.dropTable('reminder_logs')
  await qi.dropTable('outbox_messages')
}
