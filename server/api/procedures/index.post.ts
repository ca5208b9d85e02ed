import { procedureCreateSchema } from '../../../shared/schemas/procedure'
import { requireRole } from '../../utils/access'
import { createProcedureIn, procedureOut } from '../../utils/procedures'
import { inTransaction } from '../../utils/transaction'
import { parseWith } from '../../utils/validation'

/** A new procedure and its version 1. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'quality', 'admin')
  const input = await readValidatedBody(event, parseWith(procedureCreateSchema))
  const row = await inTransaction(t => createProcedureIn(t, user.id, input))
  setResponseStatus(event, 201)
  return await procedureOut(row)
})
