/**
 * What a reviewer confirms before approving a run: how many points count (voided ones are left
 * out), how many of them pass and fail under the run's decision rule, and the largest
 * |error| / tolerance — the point nearest to (or furthest beyond) its limit. Pure; the run page
 * shows it and asks for confirmation.
 */

export interface ReviewPoint {
  seq: number
  voided: boolean
  errorK: number
  /** Tolerance limit TL at the point, K (> 0). */
  toleranceK: number
  verdict: 'pass' | 'conditional-pass' | 'conditional-fail' | 'fail'
}

export interface ReviewSummary {
  points: number
  voided: number
  /** Pass and conditional pass. */
  passing: number
  /** Fail and conditional fail. */
  failing: number
  conditional: number
  /** The largest |E|/TL and the point it belongs to; null without points. */
  worst: { seq: number, ratio: number } | null
}

/**
 * @param points - the run's points with their stored results
 * @returns counts and the largest |error|/tolerance (dimensionless; above 1 the error exceeds TL)
 * @example reviewSummary([{ seq: 1, voided: false, errorK: 0.5, toleranceK: 1, verdict: 'pass' }]).worst // { seq: 1, ratio: 0.5 }
 */
export function reviewSummary(points: readonly ReviewPoint[]): ReviewSummary {
  const live = points.filter(p => !p.voided)
  let worst: ReviewSummary['worst'] = null
  for (const p of live) {
    const ratio = Math.abs(p.errorK) / p.toleranceK
    if (Number.isFinite(ratio) && (!worst || ratio > worst.ratio)) worst = { seq: p.seq, ratio }
  }
  return {
    points: live.length,
    voided: points.length - live.length,
    passing: live.filter(p => p.verdict === 'pass' || p.verdict === 'conditional-pass').length,
    failing: live.filter(p => p.verdict === 'fail' || p.verdict === 'conditional-fail').length,
    conditional: live.filter(p => p.verdict.startsWith('conditional')).length,
    worst,
  }
}
