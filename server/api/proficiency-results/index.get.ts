import { proficiencyQuerySchema } from '#shared/schemas/proficiency'
import { listProficiencyResults } from '#server/services/proficiency/proficiency'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Proficiency and comparison results, newest first. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'proficiency:read')
  const q = await getValidatedQuery(event, parseWith(proficiencyQuerySchema))
  return await listProficiencyResults(q)
})
