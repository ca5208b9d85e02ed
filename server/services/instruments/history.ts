/**
 * An instrument's calibration history as its certificates state it: for each valid certificate,
 * the error and expanded uncertainty at each temperature, read from what was issued (never the
 * live run, never drafts or unsigned runs); and the certificates that are no longer valid —
 * withdrawn (when, why) or superseded (by which revision) — so nobody relies on them unawares.
 */
import type { SessionUser } from '#shared/types'
import type { InstrumentHistoryDTO } from '#shared/types/certificates'
import { Certificate } from '#server/models/Certificate'
import { Instrument } from '#server/models/Instrument'
import { notFound } from '#server/utils/errors'
import { organizationScope } from '#server/utils/access'
import { labToday } from '#server/services/settings/today'
import type { CertificateData } from '#server/services/certificates/pdf'

export async function instrumentHistory(user: SessionUser, instrumentId: number): Promise<InstrumentHistoryDTO> {
  const instrument = await Instrument.findOne({ where: { id: instrumentId, ...organizationScope(user) }, attributes: ['id'] })
  if (!instrument) notFound('instrument')
  // A customer sees only the certificates issued to its own organization: an instrument that changed
  // hands keeps each owner's results their own.
  const certs = await Certificate.findAll({ where: { instrumentId, ...organizationScope(user) }, order: [['calibrationDate', 'ASC'], ['id', 'ASC']] })
  const byId = new Map(certs.map(c => [c.id, c]))
  const notices: InstrumentHistoryDTO['notices'] = []
  for (const c of [...certs].reverse()) {
    if (c.status === 'withdrawn') notices.push({ certificateId: c.id, number: c.number, status: 'withdrawn', on: c.withdrawnAt ? await labToday(c.withdrawnAt) : null, reason: c.withdrawalReason ?? null, supersededBy: null })
    if (c.status === 'superseded') notices.push({ certificateId: c.id, number: c.number, status: 'superseded', on: c.supersededAt ? await labToday(c.supersededAt) : null, reason: null, supersededBy: c.supersededById ? byId.get(c.supersededById)?.number ?? null : null })
  }
  return {
    instrumentId,
    calibrations: certs.filter(c => c.status === 'valid').map((c) => {
      const content = (c.content ?? {}) as Partial<CertificateData>
      const states = !!content.agreement
      return {
        certificateId: c.id,
        number: c.number,
        calibrationDate: c.calibrationDate,
        points: (content.points ?? []).map(p => ({
          stage: p.stage,
          referenceTemperatureK: p.referenceK,
          errorK: p.errorK,
          uncertaintyK: p.uncertaintyK,
          toleranceK: states ? p.toleranceK : null,
          verdict: states ? p.verdict : null,
        })),
      }
    }),
    notices,
  }
}
