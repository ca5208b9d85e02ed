/**
 * Monte Carlo check (JCGM 101) of a stored calibration point, as a progress job: the point's budget
 * becomes input distributions (shared/calibration/monteCarloPlan.ts), the trials run in the worker
 * threads of ./monteCarlo, and the summary is stored on the point when the job ends.
 */
import { COVERAGE_PROBABILITY } from '#shared/calibration/constants'
import { monteCarloPlan } from '#shared/calibration/monteCarloPlan'
import { ENGINE_VERSION } from '#shared/engine'
import type { PointMonteCarloInput } from '#shared/schemas/run'
import type { PointMonteCarloDTO, SessionUser } from '#shared/types'
import { CalibrationRun } from '#server/models/CalibrationRun'
import { RunPoint } from '#server/models/RunPoint'
import { notFound } from '#server/utils/errors'
import { recordAudit } from '#server/utils/audit'
import { startJob, type Job } from '#server/services/calculations/jobs'
import { runReadingMonteCarloExplicit } from '#server/services/calculations/monteCarlo'
import { assertNotLocked } from './workflow'
import { inTransaction } from '#server/utils/transaction'

/** Start the job (202 by the route); 409 for an approved run, 404 for a point not in the run. */
export async function startPointMonteCarlo(user: SessionUser, runId: number, pointId: number, input: PointMonteCarloInput): Promise<Job<PointMonteCarloDTO>> {
  const run = await CalibrationRun.findByPk(runId)
  if (!run) notFound('run')
  assertNotLocked(run)
  const point = await RunPoint.findOne({ where: { id: pointId, runId } })
  if (!point) notFound('point')
  const plan = monteCarloPlan(point.result)
  const version = point.version
  return startJob(user.id, input.trials, async (progress) => {
    const r = await runReadingMonteCarloExplicit({
      band: point.result.inputs.band,
      inputs: plan.inputs,
      outputTerms: plan.outputTerms,
      trials: input.trials,
      seed: input.seed,
      coverageProbability: COVERAGE_PROBABILITY,
      gum: plan.gum,
    }, progress)
    const summary: PointMonteCarloDTO = {
      trials: r.trials,
      seed: r.seed,
      coverageProbability: r.coverageProbability,
      mean: r.mean,
      standardUncertainty: r.standardUncertainty,
      coverageInterval: r.coverageInterval,
      validated: r.validated,
      tolerance: r.tolerance,
      dLow: r.dLow,
      dHigh: r.dHigh,
      notes: plan.notes,
      engineVersion: ENGINE_VERSION,
      at: new Date().toISOString(),
    }
    await inTransaction(async (t) => {
      const fresh = await CalibrationRun.findByPk(runId, { transaction: t })
      const p = await RunPoint.findOne({ where: { id: pointId, runId }, transaction: t })
      // The point changed (or the run was approved) while the job ran: the summary no longer applies.
      if (!fresh || fresh.status === 'approved' || !p || p.version !== version) return
      await RunPoint.update({ monteCarlo: summary }, { where: { id: pointId }, transaction: t, silent: true })
      await recordAudit(t, { userId: user.id, action: 'monte-carlo', entity: 'RunPoint', entityId: pointId, after: summary })
    })
    return summary
  })
}
