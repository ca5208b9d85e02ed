import crypto from 'node:crypto'
import { canonicalResponsivityText, normalizeResponsivity, parseResponsivityCsv } from '../../../shared/registers/responsivity'
import { responsivityCreateSchema } from '../../../shared/schemas/instrument'
import { SpectralResponse } from '../../models/SpectralResponse'
import { requireRole } from '../../utils/access'
import { recordAudit, snapshot } from '../../utils/audit'
import { spectralResponseDTO } from '../../utils/presentRegisters'
import { invalidInput } from '../../utils/registers'
import { inTransaction } from '../../utils/transaction'
import { parseWith } from '../../utils/validation'

/**
 * Store a tabulated responsivity (CSV: wavelength µm, relative response). The same curve —
 * same normalized content, whatever its scale, formatting or name — is stored once: posting it
 * again answers 200 with the existing row; a new curve answers 201.
 */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'technician', 'quality', 'admin')
  const input = await readValidatedBody(event, parseWith(responsivityCreateSchema))
  const parsed = parseResponsivityCsv(input.csv)
  if (!parsed.ok) invalidInput({ csv: parsed.message })
  const sha256 = crypto.createHash('sha256').update(canonicalResponsivityText(parsed.points)).digest('hex')
  const { row, created } = await inTransaction(async (t) => {
    const existing = await SpectralResponse.findOne({ where: { sha256 }, transaction: t })
    if (existing) return { row: existing, created: false }
    const row = await SpectralResponse.create({ name: input.name, sha256, points: normalizeResponsivity(parsed.points) }, { transaction: t })
    await recordAudit(t, { userId: user.id, action: 'create', entity: 'SpectralResponse', entityId: row.id, after: snapshot(row) })
    return { row, created: true }
  })
  setResponseStatus(event, created ? 201 : 200)
  return spectralResponseDTO(row)
})
