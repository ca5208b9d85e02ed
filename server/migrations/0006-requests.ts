import { DataTypes, type QueryInterface } from 'sequelize'

/** Customers' calibration requests. */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.createTable('calibration_requests', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    organizationId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'organizations', key: 'id' }, onDelete: 'RESTRICT' },
    requestedBy: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'RESTRICT' },
    instrumentIds: { type: DataTypes.JSON, allowNull: false },
    preferredDate: { type: DataTypes.DATEONLY, allowNull: true },
    notes: { type: DataTypes.TEXT, allowNull: true },
    status: { type: DataTypes.STRING(20), allowNull: false, defaultValue: 'open' },
    handledBy: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'RESTRICT' },
    handledAt: { type: DataTypes.DATE, allowNull: true },
    response: { type: DataTypes.TEXT, allowNull: true },
    runIds: { type: DataTypes.JSON, allowNull: false, defaultValue: '[]' },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  })
  await qi.addIndex('calibration_requests', ['organizationId', 'status'])
  await qi.addIndex('calibration_requests', ['status', 'createdAt'])
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.dropTable('calibration_requests')
}
