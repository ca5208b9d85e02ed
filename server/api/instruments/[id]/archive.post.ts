import { idParamSchema } from '../../../../shared/schemas/common'
import { archiveSchema } from '../../../../shared/schemas/registerQuery'
import { Instrument } from '../../../models/Instrument'
import { notFound, requireRole } from '../../../utils/access'
import { recordAudit, snapshot } from '../../../utils/audit'
import { instrumentDTOs } from '../../../utils/registersInstruments'
import { assertVersion, inTransaction } from '../../../utils/transaction'
import { parseWith } from '../../../utils/validation'

/** Archive or restore an instrument; instruments are never deleted. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'technician', 'quality', 'admin')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(archiveSchema))
  const row = await inTransaction(async (t) => {
    const row = await Instrument.findByPk(id, { transaction: t })
    if (!row) notFound('instrument')
    assertVersion(row.version, input.version)
    if (!!row.archived === input.archived) return row
    const before = snapshot(row)
    row.archived = input.archived
    await row.save({ transaction: t })
    await recordAudit(t, { userId: user.id, action: input.archived ? 'archive' : 'restore', entity: 'Instrument', entityId: row.id, before, after: snapshot(row) })
    return row
  })
  return (await instrumentDTOs([row]))[0]
})
