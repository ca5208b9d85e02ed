import { runCreateSchema } from '#shared/schemas/run'
import { createRun } from '#server/services/runs/runs'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Start a draft run; the signed-in user is its technician. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'run:edit')
  const input = await readValidatedBody(event, parseWith(runCreateSchema))
  const created = await createRun(user, input)
  setResponseStatus(event, 201)
  return created
})
