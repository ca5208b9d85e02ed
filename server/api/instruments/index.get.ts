import { LAB_ROLES } from '../../../shared/roles'
import { instrumentQuerySchema } from '../../../shared/schemas/registerQuery'
import type { InstrumentDTO, Page } from '../../../shared/types'
import { requireRole } from '../../utils/access'
import { queryInstruments } from '../../utils/instrumentQuery'
import { instrumentDTOs, visibleTo } from '../../utils/registersInstruments'
import { parseWith } from '../../utils/validation'

/**
 * Instruments, paged, sorted, filtered and searched on the server. A customer sees only its own
 * organization's instruments, whatever organizationId it asks for.
 */
export default defineEventHandler(async (event): Promise<Page<InstrumentDTO>> => {
  const user = await requireRole(event, ...LAB_ROLES, 'customer')
  const q = await getValidatedQuery(event, parseWith(instrumentQuerySchema))
  const organizationId = user.role === 'customer' ? (user.organizationId ?? -1) : q.organizationId
  const { rows, total } = await queryInstruments({ ...q, organizationId })
  return { rows: (await instrumentDTOs(rows)).map(r => visibleTo(r, user)), total, page: q.page, pageSize: q.pageSize }
})
