import { dropColumns } from './lib'
import { DataTypes, type QueryInterface } from 'sequelize'

/**
 * Assuring the validity of results and handling what goes wrong (ISO/IEC 17025:2017 6.4.9, 6.4.10,
 * 7.7, 7.9, 7.10, 8.7): intermediate check plans and results of the reference equipment, proficiency
 * test results, nonconformities with their decisions per certificate, complaints, corrective actions
 * with their items, and interval decisions. The equipment gets the reason it is out of service;
 * each external calibration of it its as-found corrections, their uncertainty and tolerance.
 * Only portable column types and `queryInterface` calls: the same on SQLite and PostgreSQL.
 */
const id = { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true }
const user = (allowNull: boolean) => ({ type: DataTypes.INTEGER, allowNull, references: { model: 'users', key: 'id' }, onDelete: 'RESTRICT' })
const stamps = {
  version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
  createdAt: { type: DataTypes.DATE, allowNull: false },
  updatedAt: { type: DataTypes.DATE, allowNull: false },
}

export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.addColumn('blackbody_sources', 'statusReason', { type: DataTypes.TEXT, allowNull: true })
  await qi.addColumn('reference_instruments', 'statusReason', { type: DataTypes.TEXT, allowNull: true })
  await qi.addColumn('equipment_calibrations', 'asFoundCorrections', { type: DataTypes.JSON, allowNull: true })
  await qi.addColumn('equipment_calibrations', 'asFoundUncertaintyK', { type: DataTypes.DOUBLE, allowNull: true })
  await qi.addColumn('equipment_calibrations', 'asFoundToleranceK', { type: DataTypes.DOUBLE, allowNull: true })
  await qi.addColumn('equipment_calibrations', 'asFoundInTolerance', { type: DataTypes.BOOLEAN, allowNull: true })

  await qi.createTable('nonconformities', {
    id,
    number: { type: DataTypes.STRING(30), allowNull: false, unique: true },
    raisedOn: { type: DataTypes.DATEONLY, allowNull: false },
    raisedBy: user(true),
    origin: { type: DataTypes.STRING(20), allowNull: false },
    originId: { type: DataTypes.INTEGER, allowNull: true },
    title: { type: DataTypes.STRING(200), allowNull: false },
    description: { type: DataTypes.TEXT, allowNull: false },
    risk: { type: DataTypes.STRING(10), allowNull: false },
    withhold: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    equipmentType: { type: DataTypes.STRING(20), allowNull: true },
    equipmentId: { type: DataTypes.INTEGER, allowNull: true },
    affectedFrom: { type: DataTypes.DATEONLY, allowNull: true },
    affectedTo: { type: DataTypes.DATEONLY, allowNull: true },
    referenceCorrections: { type: DataTypes.JSON, allowNull: true },
    affectedWork: { type: DataTypes.JSON, allowNull: true },
    notifications: { type: DataTypes.JSON, allowNull: false, defaultValue: '[]' },
    status: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'open' },
    resumedAt: { type: DataTypes.DATE, allowNull: true },
    resumedBy: user(true),
    resumeNote: { type: DataTypes.TEXT, allowNull: true },
    closedAt: { type: DataTypes.DATE, allowNull: true },
    closedBy: user(true),
    closeNote: { type: DataTypes.TEXT, allowNull: true },
    ...stamps,
  })
  await qi.addIndex('nonconformities', ['status'])
  await qi.addIndex('nonconformities', ['equipmentType', 'equipmentId'])

  await qi.createTable('nonconformity_decisions', {
    id,
    nonconformityId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'nonconformities', key: 'id' }, onDelete: 'RESTRICT' },
    certificateId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'certificates', key: 'id' }, onDelete: 'RESTRICT' },
    decision: { type: DataTypes.STRING(10), allowNull: false },
    reason: { type: DataTypes.TEXT, allowNull: false },
    revisionRunId: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'calibration_runs', key: 'id' }, onDelete: 'RESTRICT' },
    decidedBy: user(false),
    decidedAt: { type: DataTypes.DATE, allowNull: false },
    ...stamps,
  })
  await qi.addIndex('nonconformity_decisions', ['nonconformityId', 'certificateId'], { unique: true, name: 'nonconformity_decisions_once' })

  await qi.createTable('check_plans', {
    id,
    equipmentType: { type: DataTypes.STRING(20), allowNull: false },
    equipmentId: { type: DataTypes.INTEGER, allowNull: false },
    title: { type: DataTypes.STRING(200), allowNull: false },
    method: { type: DataTypes.TEXT, allowNull: false },
    intervalDays: { type: DataTypes.INTEGER, allowNull: false },
    acceptance: { type: DataTypes.STRING(10), allowNull: false },
    acceptanceLimitK: { type: DataTypes.DOUBLE, allowNull: true },
    nominalsK: { type: DataTypes.JSON, allowNull: false },
    startOn: { type: DataTypes.DATEONLY, allowNull: false },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    createdBy: user(true),
    ...stamps,
  })
  await qi.addIndex('check_plans', ['equipmentType', 'equipmentId'])

  await qi.createTable('check_results', {
    id,
    planId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'check_plans', key: 'id' }, onDelete: 'RESTRICT' },
    equipmentType: { type: DataTypes.STRING(20), allowNull: false },
    equipmentId: { type: DataTypes.INTEGER, allowNull: false },
    checkedOn: { type: DataTypes.DATEONLY, allowNull: false },
    nominalK: { type: DataTypes.DOUBLE, allowNull: false },
    nominalUncertaintyK: { type: DataTypes.DOUBLE, allowNull: true },
    measuredK: { type: DataTypes.DOUBLE, allowNull: false },
    expandedUncertaintyK: { type: DataTypes.DOUBLE, allowNull: true },
    deviationK: { type: DataTypes.DOUBLE, allowNull: false },
    en: { type: DataTypes.DOUBLE, allowNull: true },
    verdict: { type: DataTypes.STRING(10), allowNull: false },
    statement: { type: DataTypes.TEXT, allowNull: false },
    performedBy: user(false),
    notes: { type: DataTypes.TEXT, allowNull: true },
    nonconformityId: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'nonconformities', key: 'id' }, onDelete: 'RESTRICT' },
    ...stamps,
  })
  await qi.addIndex('check_results', ['planId', 'checkedOn'])
  await qi.addIndex('check_results', ['equipmentType', 'equipmentId', 'checkedOn'])
  await qi.addIndex('check_results', ['verdict', 'checkedOn'])

  await qi.createTable('proficiency_results', {
    id,
    schemeType: { type: DataTypes.STRING(30), allowNull: false },
    scheme: { type: DataTypes.STRING(200), allowNull: false },
    round: { type: DataTypes.STRING(120), allowNull: false },
    artefact: { type: DataTypes.STRING(200), allowNull: false },
    pointK: { type: DataTypes.DOUBLE, allowNull: false },
    labValueK: { type: DataTypes.DOUBLE, allowNull: false },
    labUncertaintyK: { type: DataTypes.DOUBLE, allowNull: false },
    referenceValueK: { type: DataTypes.DOUBLE, allowNull: false },
    referenceUncertaintyK: { type: DataTypes.DOUBLE, allowNull: false },
    sigmaPtK: { type: DataTypes.DOUBLE, allowNull: true },
    en: { type: DataTypes.DOUBLE, allowNull: false },
    enVerdict: { type: DataTypes.STRING(20), allowNull: false },
    z: { type: DataTypes.DOUBLE, allowNull: true },
    zVerdict: { type: DataTypes.STRING(20), allowNull: true },
    verdict: { type: DataTypes.STRING(20), allowNull: false },
    reportedOn: { type: DataTypes.DATEONLY, allowNull: false },
    notes: { type: DataTypes.TEXT, allowNull: true },
    nonconformityId: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'nonconformities', key: 'id' }, onDelete: 'RESTRICT' },
    recordedBy: user(false),
    ...stamps,
  })
  await qi.addIndex('proficiency_results', ['reportedOn'])

  await qi.createTable('complaints', {
    id,
    number: { type: DataTypes.STRING(30), allowNull: false, unique: true },
    organizationId: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'organizations', key: 'id' }, onDelete: 'RESTRICT' },
    certificateId: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'certificates', key: 'id' }, onDelete: 'RESTRICT' },
    instrumentId: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'instruments', key: 'id' }, onDelete: 'RESTRICT' },
    channel: { type: DataTypes.STRING(20), allowNull: false },
    submittedBy: user(false),
    receivedOn: { type: DataTypes.DATEONLY, allowNull: false },
    subject: { type: DataTypes.STRING(200), allowNull: false },
    description: { type: DataTypes.TEXT, allowNull: false },
    status: { type: DataTypes.STRING(20), allowNull: false, defaultValue: 'received' },
    involvedUserIds: { type: DataTypes.JSON, allowNull: false, defaultValue: '[]' },
    acknowledgedAt: { type: DataTypes.DATE, allowNull: true },
    investigation: { type: DataTypes.TEXT, allowNull: true },
    investigatedBy: user(true),
    outcome: { type: DataTypes.TEXT, allowNull: true },
    outcomeProposedBy: user(true),
    outcomeProposedAt: { type: DataTypes.DATE, allowNull: true },
    approvedBy: user(true),
    approvedAt: { type: DataTypes.DATE, allowNull: true },
    closedAt: { type: DataTypes.DATE, allowNull: true },
    nonconformityId: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'nonconformities', key: 'id' }, onDelete: 'RESTRICT' },
    ...stamps,
  })
  await qi.addIndex('complaints', ['organizationId', 'status'])
  await qi.addIndex('complaints', ['status', 'receivedOn'])

  await qi.createTable('corrective_actions', {
    id,
    number: { type: DataTypes.STRING(30), allowNull: false, unique: true },
    nonconformityId: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'nonconformities', key: 'id' }, onDelete: 'RESTRICT' },
    complaintId: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'complaints', key: 'id' }, onDelete: 'RESTRICT' },
    title: { type: DataTypes.STRING(200), allowNull: false },
    cause: { type: DataTypes.TEXT, allowNull: false },
    openedOn: { type: DataTypes.DATEONLY, allowNull: false },
    openedBy: user(false),
    effectivenessDueOn: { type: DataTypes.DATEONLY, allowNull: true },
    effectivenessCheck: { type: DataTypes.TEXT, allowNull: true },
    effective: { type: DataTypes.BOOLEAN, allowNull: true },
    effectivenessCheckedBy: user(true),
    effectivenessCheckedAt: { type: DataTypes.DATE, allowNull: true },
    status: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'open' },
    closedAt: { type: DataTypes.DATE, allowNull: true },
    closedBy: user(true),
    ...stamps,
  })
  await qi.addIndex('corrective_actions', ['status'])

  await qi.createTable('corrective_action_items', {
    id,
    correctiveActionId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'corrective_actions', key: 'id' }, onDelete: 'RESTRICT' },
    description: { type: DataTypes.TEXT, allowNull: false },
    ownerId: user(false),
    dueDate: { type: DataTypes.DATEONLY, allowNull: false },
    doneOn: { type: DataTypes.DATEONLY, allowNull: true },
    doneBy: user(true),
    doneNote: { type: DataTypes.TEXT, allowNull: true },
    ...stamps,
  })
  await qi.addIndex('corrective_action_items', ['correctiveActionId'])
  await qi.addIndex('corrective_action_items', ['doneOn', 'dueDate'])

  await qi.createTable('interval_decisions', {
    id,
    itemType: { type: DataTypes.STRING(20), allowNull: false },
    itemId: { type: DataTypes.INTEGER, allowNull: false },
    method: { type: DataTypes.STRING(20), allowNull: false },
    proposedMonths: { type: DataTypes.INTEGER, allowNull: true },
    decidedMonths: { type: DataTypes.INTEGER, allowNull: false },
    reason: { type: DataTypes.TEXT, allowNull: false },
    analysis: { type: DataTypes.JSON, allowNull: true },
    decidedOn: { type: DataTypes.DATEONLY, allowNull: false },
    decidedBy: user(false),
    ...stamps,
  })
  await qi.addIndex('interval_decisions', ['itemType', 'itemId'])
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  for (const t of ['interval_decisions', 'corrective_action_items', 'corrective_actions', 'complaints', 'proficiency_results', 'check_results', 'check_plans', 'nonconformity_decisions', 'nonconformities']) await qi.dropTable(t)
  await dropColumns(qi, 'equipment_calibrations', ['asFoundInTolerance'])
  await dropColumns(qi, 'equipment_calibrations', ['asFoundToleranceK'])
  await dropColumns(qi, 'equipment_calibrations', ['asFoundUncertaintyK'])
  await dropColumns(qi, 'equipment_calibrations', ['asFoundCorrections'])
  await dropColumns(qi, 'reference_instruments', ['statusReason'])
  await dropColumns(qi, 'blackbody_sources', ['statusReason'])
}
