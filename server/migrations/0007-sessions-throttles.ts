import { DataTypes, type QueryInterface } from 'sequelize'

/**
 * Server-side session records (a session ends at sign-out, and every session of a user ends when
 * their password is reset or they are deactivated) and the hits counted by rate limits (sign-in,
 * signing passwords, public verification), so limits hold across restarts and server instances.
 */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.createTable('user_sessions', {
    id: { type: DataTypes.STRING(64), primaryKey: true },
    userId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'RESTRICT' },
    createdAt: { type: DataTypes.DATE, allowNull: false },
    expiresAt: { type: DataTypes.DATE, allowNull: false },
    revokedAt: { type: DataTypes.DATE, allowNull: true },
    revokedReason: { type: DataTypes.STRING(40), allowNull: true },
    address: { type: DataTypes.STRING(100), allowNull: true },
    userAgent: { type: DataTypes.STRING(300), allowNull: true },
  })
  await qi.addIndex('user_sessions', ['userId', 'revokedAt'])

  await qi.createTable('throttle_hits', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    key: { type: DataTypes.STRING(300), allowNull: false },
    /** Milliseconds since the epoch. */
    at: { type: DataTypes.BIGINT, allowNull: false },
  })
  await qi.addIndex('throttle_hits', ['key', 'at'])
  await qi.addIndex('throttle_hits', ['at'])
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.dropTable('throttle_hits')
  await qi.dropTable('user_sessions')
}
