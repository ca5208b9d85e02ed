import { instrumentCreateSchema } from '#shared/schemas/instrument'
import { createInstrument } from '#server/services/instruments/instruments'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Register a customer's instrument. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'instrument:edit')
  const input = await readValidatedBody(event, parseWith(instrumentCreateSchema))
  const row = await createInstrument(user, input)
  setResponseStatus(event, 201)
  return row
})
