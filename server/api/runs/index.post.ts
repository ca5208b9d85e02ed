import { runCreateSchema } from '../../../shared/schemas/run'
import { requireRole } from '../../utils/access'
import { createRunIn, runDetail } from '../../utils/runs'
import { inTransaction } from '../../utils/transaction'
import { parseWith } from '../../utils/validation'

/** Start a draft run; the signed-in user is its technician. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'technician', 'quality', 'admin')
  const input = await readValidatedBody(event, parseWith(runCreateSchema))
  const run = await inTransaction(t => createRunIn(t, user, input))
  setResponseStatus(event, 201)
  return await runDetail(run.id)
})
