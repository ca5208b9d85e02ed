import { procedureCreateSchema } from '#shared/schemas/procedure'
import { createProcedure } from '#server/services/procedures/procedures'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** A new procedure and its version 1. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'procedure:edit')
  const input = await readValidatedBody(event, parseWith(procedureCreateSchema))
  const procedure = await createProcedure(user, input)
  setResponseStatus(event, 201)
  return procedure
})
