/** The agreed terms a run works to (ISO/IEC 17025 7.1.3): read from its calibration request. */
import type { Transaction } from 'sequelize'
import type { RunAgreementDTO } from '#shared/types'
import { CalibrationRequest } from '#server/models/CalibrationRequest'
import { User } from '#server/models/User'

/**
 * The terms a run works to: those of its request when the customer agreed to them and they still
 * stand (`current` false when they were changed after the agreement), or null.
 */
export async function agreementOf(requestId: number | null, transaction?: Transaction): Promise<RunAgreementDTO | null> {
  if (!requestId) return null
  const r = await CalibrationRequest.findByPk(requestId, { transaction })
  if (!r || !r.terms || r.agreedTermsVersion === null || !r.agreedAt || !r.agreementMethod) return null
  const agreedBy = r.agreedBy ? await User.findByPk(r.agreedBy, { attributes: ['name'], transaction }) : null
  return {
    requestId: r.id,
    termsVersion: r.agreedTermsVersion,
    agreedAt: r.agreedAt.toISOString(),
    method: r.agreementMethod,
    note: r.agreementNote ?? null,
    agreedByName: agreedBy?.name ?? null,
    decisionRule: r.terms.decisionRule,
    guardBandFactor: r.terms.guardBandFactor ?? null,
    specification: r.terms.specification ?? null,
    pointsK: [...r.terms.pointsK],
    current: r.agreedTermsVersion === r.termsVersion && ['agreed', 'accepted'].includes(r.status),
  }
}

