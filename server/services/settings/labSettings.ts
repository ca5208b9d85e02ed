/** The laboratory's settings (one row): identity and address, certificate numbering, signatory functions and the statements printed on certificates. */
import { createError } from 'h3'
import type { Transaction } from 'sequelize'
import { formatCertificateNumber } from '#shared/certificates/numbers'
import { labSettingsSchema, type LabSettingsUpdateInput } from '#shared/schemas/certificate'
import type { LabSettingsDTO, SessionUser } from '#shared/types'
import { LabSettings } from '#server/models/LabSettings'
import { recordAudit, snapshot } from '#server/utils/audit'
import { checkMerged } from '#server/utils/validation'
import { assertVersion } from '#server/utils/errors'
import { inTransaction } from '#server/utils/transaction'
import { forgetLabTimeZone } from './today'

/** The laboratory's settings row; 409 when it was never set up (the demo seed and an admin create it). */
export async function labSettingsRow(t?: Transaction): Promise<LabSettings> {
  const row = await LabSettings.findOne({ order: [['id', 'ASC']], transaction: t })
  if (!row) {
    throw createError({ statusCode: 409, statusMessage: 'Conflict', message: 'The laboratory settings have not been set up yet: an administrator enters them first', data: { fields: { settings: 'Not set up' } } })
  }
  return row
}

export function labSettingsDTO(s: LabSettings): LabSettingsDTO {
  return {
    name: s.name,
    addressLines: s.addressLines,
    city: s.city,
    postcode: s.postcode ?? null,
    country: s.country,
    email: s.email ?? null,
    phone: s.phone ?? null,
    accreditationBody: s.accreditationBody,
    accreditationNumber: s.accreditationNumber,
    numberPrefix: s.numberPrefix,
    numberIncludesYear: !!s.numberIncludesYear,
    numberDigits: s.numberDigits,
    numberExample: formatCertificateNumber(numberFormat(s), new Date().getUTCFullYear(), 42),
    signatoryFunctions: [...s.signatoryFunctions],
    traceabilityStatement: s.traceabilityStatement,
    decisionRuleStatement: s.decisionRuleStatement,
    itemsStatement: s.itemsStatement,
    reproductionStatement: s.reproductionStatement ?? null,
    timeZone: s.timeZone,
    version: s.version,
    updatedAt: s.updatedAt.toISOString(),
  }
}

/** The numbering settings of a laboratory in the form shared/certificates/numbers.ts takes. */
export const numberFormat = (s: LabSettings) => ({ prefix: s.numberPrefix, includeYear: !!s.numberIncludesYear, sequenceDigits: s.numberDigits })

/** PATCH /api/settings/lab: the merged settings must be complete and valid; 409 when stale. */
export async function updateLabSettingsIn(t: Transaction, actor: SessionUser, input: LabSettingsUpdateInput): Promise<LabSettings> {
  const row = await labSettingsRow(t)
  assertVersion(row.version, input.version)
  const { version: _v, ...changes } = input
  const merged = checkMerged(labSettingsSchema, { ...labSettingsDTO(row), ...changes })
  const before = snapshot(row)
  row.set({ ...merged, postcode: merged.postcode ?? null, email: merged.email ?? null, phone: merged.phone ?? null, reproductionStatement: merged.reproductionStatement ?? null })
  if (!row.changed()) return row
  await row.save({ transaction: t })
  await recordAudit(t, { userId: actor.id, action: 'update', entity: 'LabSettings', entityId: row.id, before, after: snapshot(row) })
  return row
}

// ---------------------------------------------------------------- signing

export async function labSettings(): Promise<LabSettingsDTO> {
  return labSettingsDTO(await labSettingsRow())
}

export async function updateLabSettings(actor: SessionUser, input: LabSettingsUpdateInput): Promise<LabSettingsDTO> {
  const row = await inTransaction(t => updateLabSettingsIn(t, actor, input))
  forgetLabTimeZone()
  return labSettingsDTO(row)
}
