/**
 * Monte Carlo check (JCGM 101) of a stored calibration point, as a progress job: the point's budget
 * becomes input distributions (shared/calibration/monteCarloPlan.ts: Type B lines from their stated
 * distributions, correlated pairs sampled jointly), the trials run in the worker threads of
 * server/services/calculations/monteCarlo.ts — a fixed number, or the adaptive procedure of JCGM 101
 * 7.9 with the count reported — and the summary with its §8 comparison is stored on the point.
 */
import { COVERAGE_PROBABILITY } from '#shared/calibration/constants'
import { monteCarloPlan, monteCarloPlanInputs } from '#shared/calibration/monteCarloPlan'
import { compileInputs } from '#shared/uncertainty/montecarlo'
import { ENGINE_VERSION } from '#shared/engine'
import type { PointMonteCarloInput } from '#shared/schemas/run'
import type { PointMonteCarloDTO, SessionUser } from '#shared/types'
import { CalibrationRun } from '#server/models/CalibrationRun'
import { RunPoint } from '#server/models/RunPoint'
import { engine, notFound } from '#server/utils/errors'
import { recordAudit } from '#server/utils/audit'
import { startJob, type Job } from '#server/services/calculations/jobs'
import { runPlanMonteCarlo } from '#server/services/calculations/monteCarlo'
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
  // a plan the sampler refuses (e.g. a correlation two distributions cannot reach) is a 400 now, not a failed job
  engine(() => {
    const { inputs, correlations } = monteCarloPlanInputs(plan)
    return compileInputs(inputs, correlations).kind.length
  })
  const version = point.version
  // JCGM 101 7.9: batches of max(J, 10⁴) trials (J = ⌈100/(1 − p)⌉ = 2198 at p = 95.45 %), at most 2 × 10⁶
  const adaptive = input.adaptive ? { significantDigits: input.adaptive === true ? 2 : input.adaptive.significantDigits, maxTrials: 2_000_000 } : null
  return startJob(user.id, adaptive ? adaptive.maxTrials : input.trials, async (progress) => {
    const r = await runPlanMonteCarlo(plan, { trials: input.trials, seed: input.seed, coverageProbability: COVERAGE_PROBABILITY, adaptive }, progress)
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
      adaptive: r.adaptive,
      correlations: r.correlations,
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
