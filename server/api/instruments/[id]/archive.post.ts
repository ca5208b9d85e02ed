import { idParamSchema } from '#shared/schemas/common'
import { archiveSchema } from '#shared/schemas/registerQuery'
import { archiveInstrument } from '#server/services/instruments/instruments'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Archive or restore an instrument; instruments are never deleted. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'instrument:edit')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(archiveSchema))
  return await archiveInstrument(user, id, input)
})
