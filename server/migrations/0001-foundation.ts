import { DataTypes, type QueryInterface } from 'sequelize'
import { createPgGuard, dialectOf, dropGuard } from './lib'

/** Organizations, users and the audit trail. */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.createTable('organizations', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    name: { type: DataTypes.STRING(160), allowNull: false, unique: true },
    contactEmails: { type: DataTypes.JSON, allowNull: false, defaultValue: '[]' },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  })

  await qi.createTable('users', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(120), allowNull: false },
    role: { type: DataTypes.STRING(20), allowNull: false },
    passwordHash: { type: DataTypes.STRING(400), allowNull: false },
    organizationId: {
      type: DataTypes.INTEGER,
      allowNull: true,
      references: { model: 'organizations', key: 'id' },
      onDelete: 'RESTRICT',
    },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  })
  await qi.addIndex('users', ['organizationId'])

  await qi.createTable('audit_events', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    at: { type: DataTypes.DATE, allowNull: false },
    userId: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'RESTRICT' },
    action: { type: DataTypes.STRING(60), allowNull: false },
    entity: { type: DataTypes.STRING(60), allowNull: false },
    entityId: { type: DataTypes.INTEGER, allowNull: true },
    before: { type: DataTypes.JSON, allowNull: true },
    after: { type: DataTypes.JSON, allowNull: true },
  })
  await qi.addIndex('audit_events', ['entity', 'entityId'])
  await qi.addIndex('audit_events', ['at'])
  await qi.addIndex('audit_events', ['userId'])

  // The audit trail is append-only, whatever code runs against the database.
  if (dialectOf(qi) === 'postgres') {
    await createPgGuard(qi, { name: 'audit_events_no_update', table: 'audit_events', event: 'UPDATE', message: 'audit events cannot be changed' })
    await createPgGuard(qi, { name: 'audit_events_no_delete', table: 'audit_events', event: 'DELETE', message: 'audit events cannot be deleted' })
    return
  }
  await qi.sequelize.query(`CREATE TRIGGER audit_events_no_update BEFORE UPDATE ON audit_events
    BEGIN SELECT RAISE(ABORT, 'audit events cannot be changed'); END`)
  await qi.sequelize.query(`CREATE TRIGGER audit_events_no_delete BEFORE DELETE ON audit_events
    BEGIN SELECT RAISE(ABORT, 'audit events cannot be deleted'); END`)
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await dropGuard(qi, 'audit_events_no_delete', 'audit_events')
  await dropGuard(qi, 'audit_events_no_update', 'audit_events')
  await qi.dropTable('audit_events')
  await qi.dropTable('users')
  await qi.dropTable('organizations')
}
