import { idParamSchema } from '../../../../shared/schemas/common'
import { organizationUpdateSchema } from '../../../../shared/schemas/organization'
import { Organization } from '../../../models/Organization'
import { notFound, requireRole } from '../../../utils/access'
import { recordAudit, snapshot } from '../../../utils/audit'
import { organizationDTO } from '../../../utils/present'
import { assertVersion, inTransaction } from '../../../utils/transaction'
import { parseWith } from '../../../utils/validation'

/** Edit name and contact addresses, deactivate or reactivate (never delete). */
export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, 'admin')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(organizationUpdateSchema))
  const org = await inTransaction(async (t) => {
    const org = await Organization.findByPk(id, { transaction: t })
    if (!org) notFound('organization')
    assertVersion(org.version, input.version)
    const before = snapshot(org)
    if (input.name !== undefined) org.name = input.name
    if (input.contactEmails !== undefined) org.contactEmails = input.contactEmails
    if (input.active !== undefined) org.active = input.active
    await org.save({ transaction: t })
    const action = input.active === false && before.active ? 'deactivate' : input.active === true && !before.active ? 'reactivate' : 'update'
    await recordAudit(t, { userId: admin.id, action, entity: 'Organization', entityId: org.id, before, after: snapshot(org) })
    return org
  })
  return organizationDTO(org)
})
