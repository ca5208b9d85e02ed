import { responsivityCreateSchema } from '#shared/schemas/instrument'
import { storeResponsivity } from '#server/services/responsivities/responsivities'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/**
 * Store a tabulated responsivity (CSV: wavelength µm, relative response). The same curve —
 * same normalized content, whatever its scale, formatting or name — is stored once: posting it
 * again answers 200 with the existing row; a new curve answers 201.
 */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'responsivity:edit')
  const input = await readValidatedBody(event, parseWith(responsivityCreateSchema))
  const { table, created } = await storeResponsivity(user, input)
  setResponseStatus(event, created ? 201 : 200)
  return table
})
