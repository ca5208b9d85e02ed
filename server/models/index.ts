// Importing this file registers every model and association with the Sequelize instance.
export { Organization } from './Organization'
export { User } from './User'
export { AuditEvent } from './AuditEvent'
