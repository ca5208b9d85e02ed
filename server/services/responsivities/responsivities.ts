/**
 * Tabulated spectral responsivities (wavelength µm, relative response), shared by instruments.
 * The same curve — same normalized content, whatever its scale, formatting or name — is stored once.
 */
import crypto from 'node:crypto'
import { canonicalResponsivityText, normalizeResponsivity, parseResponsivityCsv } from '#shared/registers/responsivity'
import type { ResponsivityCreateInput } from '#shared/schemas/instrument'
import type { ResponsivityQuery } from '#shared/schemas/registerQuery'
import type { Page, SessionUser, SpectralResponseDTO } from '#shared/types'
import { SpectralResponse } from '#server/models/SpectralResponse'
import { createAudited } from '#server/utils/audit'
import { invalidInput, notFound } from '#server/utils/errors'
import { ListFilter } from '#server/utils/search'
import { inTransaction } from '#server/utils/transaction'
import { spectralResponseDTO } from './dto'

/** Tables by name (a search finds any part of it), paged. */
export async function listResponsivities(q: ResponsivityQuery): Promise<Page<SpectralResponseDTO>> {
  const filter = new ListFilter()
  if (q.q) filter.text('SpectralResponse', ['name'], q.q, 'contains')
  const { rows, count } = await SpectralResponse.findAndCountAll({ ...filter.options(), order: [['name', 'ASC'], ['id', 'ASC']], limit: q.pageSize, offset: (q.page - 1) * q.pageSize })
  return { rows: rows.map(spectralResponseDTO), total: count, page: q.page, pageSize: q.pageSize }
}

export async function responsivityDetail(id: number): Promise<SpectralResponseDTO> {
  const row = await SpectralResponse.findByPk(id)
  if (!row) notFound('responsivity table')
  return spectralResponseDTO(row)
}

/** Store a table from CSV; `created` is false when the same curve was stored before (that row is returned). */
export async function storeResponsivity(actor: SessionUser, input: ResponsivityCreateInput): Promise<{ table: SpectralResponseDTO, created: boolean }> {
  const parsed = parseResponsivityCsv(input.csv)
  if (!parsed.ok) invalidInput({ csv: parsed.message })
  const sha256 = crypto.createHash('sha256').update(canonicalResponsivityText(parsed.points)).digest('hex')
  return inTransaction(async (t) => {
    const existing = await SpectralResponse.findOne({ where: { sha256 }, transaction: t })
    if (existing) return { table: spectralResponseDTO(existing), created: false }
    const row = await createAudited(t, actor, SpectralResponse, { name: input.name, sha256, points: normalizeResponsivity(parsed.points) }, { entity: 'SpectralResponse' })
    return { table: spectralResponseDTO(row), created: true }
  })
}
