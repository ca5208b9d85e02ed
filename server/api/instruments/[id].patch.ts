import { idParamSchema } from '#shared/schemas/common'
import { instrumentUpdateSchema } from '#shared/schemas/instrument'
import { updateInstrument } from '#server/services/instruments/instruments'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Change an instrument (any subset of its fields, with the version last seen). */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'instrument:edit')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(instrumentUpdateSchema))
  return await updateInstrument(user, id, input)
})
