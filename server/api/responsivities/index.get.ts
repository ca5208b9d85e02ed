import { LAB_ROLES } from '../../../shared/roles'
import { responsivityQuerySchema } from '../../../shared/schemas/registerQuery'
import type { Page, SpectralResponseDTO } from '../../../shared/types'
import { SpectralResponse } from '../../models/SpectralResponse'
import { requireRole } from '../../utils/access'
import { spectralResponseDTO } from '../../utils/presentRegisters'
import { parseWith } from '../../utils/validation'
import { Op } from 'sequelize'

/** The stored responsivity tables, by name. */
export default defineEventHandler(async (event): Promise<Page<SpectralResponseDTO>> => {
  await requireRole(event, ...LAB_ROLES)
  const q = await getValidatedQuery(event, parseWith(responsivityQuerySchema))
  const where = q.q ? { name: { [Op.like]: `%${q.q.replace(/[\\%_]/g, m => `\\${m}`)}%` } } : {}
  const { rows, count } = await SpectralResponse.findAndCountAll({ where, order: [['name', 'ASC'], ['id', 'ASC']], limit: q.pageSize, offset: (q.page - 1) * q.pageSize })
  return { rows: rows.map(spectralResponseDTO), total: count, page: q.page, pageSize: q.pageSize }
})
