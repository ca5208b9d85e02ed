/**
 * An instrument's calibration history as its certificates state it: for each valid certificate
 * (superseded revisions and withdrawn certificates are left out), the error and expanded
 * uncertainty at each temperature. Only certified results — never drafts or unsigned runs.
 */
import type { SessionUser } from '#shared/types'
import type { InstrumentHistoryDTO } from '#shared/types/certificates'
import { Certificate } from '#server/models/Certificate'
import { Instrument } from '#server/models/Instrument'
import { RunPoint } from '#server/models/RunPoint'
import { notFound } from '#server/utils/errors'
import { organizationScope } from '#server/utils/access'

export async function instrumentHistory(user: SessionUser, instrumentId: number): Promise<InstrumentHistoryDTO> {
  const instrument = await Instrument.findOne({ where: { id: instrumentId, ...organizationScope(user) }, attributes: ['id'] })
  if (!instrument) notFound('instrument')
  // A customer sees only the certificates issued to its own organization: an instrument that changed
  // hands keeps each owner's results their own.
  const certs = await Certificate.findAll({ where: { instrumentId, status: 'valid', ...organizationScope(user) }, order: [['calibrationDate', 'ASC'], ['id', 'ASC']], attributes: ['id', 'number', 'calibrationDate', 'runId'] })
  const points = certs.length ? await RunPoint.findAll({ where: { runId: certs.map(c => c.runId) }, order: [['seq', 'ASC']] }) : []
  return {
    instrumentId,
    calibrations: certs.map(c => ({
      certificateId: c.id,
      number: c.number,
      calibrationDate: c.calibrationDate,
      points: points.filter(p => p.runId === c.runId).map(p => ({
        stage: p.stage,
        referenceTemperatureK: p.result.referenceTemperatureK,
        errorK: p.result.errorK,
        uncertaintyK: p.result.budget.statedUncertaintyK,
        toleranceK: p.result.conformity.tolerance,
        verdict: p.result.conformity.verdict,
      })),
    })),
  }
}
