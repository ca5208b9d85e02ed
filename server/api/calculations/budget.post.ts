import { LAB_ROLES } from '../../../shared/roles'
import { budgetSchema } from '../../../shared/schemas/calculation'
import { evaluateBudget } from '../../../shared/uncertainty/budget'
import { requireRole } from '../../utils/access'
import { budgetOverflowField, engine } from '../../utils/engine'
import { parseWith } from '../../utils/validation'

/** GUM uncertainty budget: u_c, ν_eff (null = infinite), k, U and each component's contribution. */
export default defineEventHandler(async (event) => {
  await requireRole(event, ...LAB_ROLES)
  const { components, coverageProbability } = await readValidatedBody(event, parseWith(budgetSchema))
  return engine(() => evaluateBudget(components, { coverageProbability }), r => budgetOverflowField(components, r.contributions))
})
