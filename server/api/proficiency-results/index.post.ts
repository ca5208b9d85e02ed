import { proficiencyCreateSchema } from '#shared/schemas/proficiency'
import { recordProficiency } from '#server/services/proficiency/proficiency'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Record a result with its E_n (and z where the scheme reports σ_pt); an unsatisfactory one raises a nonconformity. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'proficiency:edit')
  const input = await readValidatedBody(event, parseWith(proficiencyCreateSchema))
  const recorded = await recordProficiency(user, input)
  setResponseStatus(event, 201)
  return recorded
})
