import { LAB_ROLES } from '../../../../shared/roles'
import { correctionAt, CorrectionRangeError } from '../../../../shared/registers/correction'
import { idParamSchema } from '../../../../shared/schemas/common'
import { correctionQuerySchema } from '../../../../shared/schemas/source'
import type { CorrectionDTO } from '../../../../shared/types'
import { BlackbodySource } from '../../../models/BlackbodySource'
import { notFound, requireRole } from '../../../utils/access'
import { invalidInput } from '../../../utils/registers'
import { parseWith } from '../../../utils/validation'

/**
 * The certificate correction at a set-point, interpolated linearly in the source's table;
 * 400 on `setPointK` outside the table (corrections are not extrapolated).
 */
export default defineEventHandler(async (event): Promise<CorrectionDTO> => {
  await requireRole(event, ...LAB_ROLES)
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const { setPointK } = await getValidatedQuery(event, parseWith(correctionQuerySchema))
  const source = await BlackbodySource.findByPk(id)
  if (!source) notFound('source')
  try {
    return { setPointK, correctionK: correctionAt(source.corrections ?? [], setPointK) }
  }
  catch (err) {
    if (err instanceof CorrectionRangeError) invalidInput({ setPointK: err.message })
    throw err
  }
})
