import { instrumentCreateSchema } from '../../../shared/schemas/instrument'
import { Instrument } from '../../models/Instrument'
import { requireRole } from '../../utils/access'
import { recordAudit, snapshot } from '../../utils/audit'
import { assertInstrumentReferences, instrumentDTOs } from '../../utils/registersInstruments'
import { inTransaction } from '../../utils/transaction'
import { parseWith } from '../../utils/validation'

/** Register a customer's instrument (nextDueDate is set by hand for a new instrument). */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'technician', 'quality', 'admin')
  const input = await readValidatedBody(event, parseWith(instrumentCreateSchema))
  const row = await inTransaction(async (t) => {
    await assertInstrumentReferences(input, t)
    const created = await Instrument.create(input, { transaction: t })
    await recordAudit(t, { userId: user.id, action: 'create', entity: 'Instrument', entityId: created.id, after: snapshot(created) })
    return created
  })
  setResponseStatus(event, 201)
  return (await instrumentDTOs([row]))[0]
})
