import { budgetSchema } from '#shared/schemas/calculation'
import { budgetOf } from '#server/services/calculations/calculations'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** GUM uncertainty budget: u_c, ν_eff (null = infinite), k, U and each component's contribution. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'calculation:run')
  return budgetOf(await readValidatedBody(event, parseWith(budgetSchema)))
})
