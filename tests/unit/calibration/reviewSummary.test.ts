// The reviewer's summary: counts by verdict with voided points left out, and the largest
// |error|/tolerance. Cases built here by hand (the ratios are plain divisions).
import { describe, expect, it } from 'vitest'
import { reviewSummary } from '../../../shared/calibration/reviewSummary'

describe('reviewSummary', () => {
  it('counts the points that count and finds the one nearest its limit', () => {
    const s = reviewSummary([
      { seq: 1, voided: false, errorK: 0.3, toleranceK: 1, verdict: 'pass' },
      { seq: 2, voided: false, errorK: -0.9, toleranceK: 1.2, verdict: 'conditional-pass' }, // 0.75
      { seq: 3, voided: true, errorK: 5, toleranceK: 1, verdict: 'fail' }, // voided: never counted
      { seq: 4, voided: false, errorK: 1.6, toleranceK: 1.5, verdict: 'fail' }, // 1.0667
    ])
    expect(s).toMatchObject({ points: 3, voided: 1, passing: 2, failing: 1, conditional: 1 })
    expect(s.worst!.seq).toBe(4)
    expect(s.worst!.ratio).toBeCloseTo(1.6 / 1.5, 12)
  })
  it('has no worst point without points', () => {
    expect(reviewSummary([]).worst).toBeNull()
    expect(reviewSummary([{ seq: 1, voided: true, errorK: 1, toleranceK: 1, verdict: 'pass' }])).toMatchObject({ points: 0, voided: 1, worst: null })
  })
})
