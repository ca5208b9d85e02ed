import { organizationCreateSchema } from '../../../../shared/schemas/organization'
import { Organization } from '../../../models/Organization'
import { requireRole } from '../../../utils/access'
import { recordAudit, snapshot } from '../../../utils/audit'
import { organizationDTO } from '../../../utils/present'
import { inTransaction } from '../../../utils/transaction'
import { parseWith } from '../../../utils/validation'

export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, 'admin')
  const input = await readValidatedBody(event, parseWith(organizationCreateSchema))
  const org = await inTransaction(async (t) => {
    const created = await Organization.create({ name: input.name, contactEmails: input.contactEmails }, { transaction: t })
    await recordAudit(t, { userId: admin.id, action: 'create', entity: 'Organization', entityId: created.id, after: snapshot(created) })
    return created
  })
  setResponseStatus(event, 201)
  return organizationDTO(org)
})
