import { LAB_ROLES } from '../../../shared/roles'
import { conformitySchema } from '../../../shared/schemas/calculation'
import { evaluateConformity } from '../../../shared/uncertainty/conformity'
import { requireRole } from '../../utils/access'
import { engine } from '../../utils/engine'
import { parseWith } from '../../utils/validation'

/** Conformity of an error of indication with an accuracy specification under a decision rule (ILAC-G8). */
export default defineEventHandler(async (event) => {
  await requireRole(event, ...LAB_ROLES)
  const input = await readValidatedBody(event, parseWith(conformitySchema))
  return engine(() => evaluateConformity(input), 'error')
})
