import { idParamSchema } from '../../../shared/schemas/common'
import { instrumentCreateSchema, instrumentUpdateSchema } from '../../../shared/schemas/instrument'
import { Instrument } from '../../models/Instrument'
import { notFound, requireRole } from '../../utils/access'
import { recordAudit, snapshot } from '../../utils/audit'
import { changes, checkMerged } from '../../utils/registers'
import { assertInstrumentReferences, instrumentDTOs } from '../../utils/registersInstruments'
import { assertVersion, inTransaction } from '../../utils/transaction'
import { parseWith } from '../../utils/validation'

/** Edit an instrument (409 when the version is stale; the merged record is re-checked). */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'technician', 'quality', 'admin')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(instrumentUpdateSchema))
  const row = await inTransaction(async (t) => {
    const row = await Instrument.findByPk(id, { transaction: t })
    if (!row) notFound('instrument')
    assertVersion(row.version, input.version)
    const before = snapshot(row)
    const { id: _id, version: _v, archived: _a, createdAt: _c, updatedAt: _u, ...stored } = before
    const merged = checkMerged(instrumentCreateSchema, { ...stored, ...changes(input) })
    await assertInstrumentReferences(merged, t)
    row.set(merged)
    if (!row.changed()) return row
    await row.save({ transaction: t })
    await recordAudit(t, { userId: user.id, action: 'update', entity: 'Instrument', entityId: row.id, before, after: snapshot(row) })
    return row
  })
  return (await instrumentDTOs([row]))[0]
})
