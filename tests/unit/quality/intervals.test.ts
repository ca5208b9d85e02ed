// Calibration intervals of the laboratory's own equipment.
// Staircase: ILAC-G24:2007 / OIML D 10:2007 method 1 (numbering from memory); the "lengthen only within
// 80 % of the MPE" variant is common practice. Expected months are hand-computed from the rule
// (interval × factor, rounded down to whole months, held within the limits).
// Drift: hand-computed closed forms (below), and numpy/scipy values from tests/reference/drift_interval.py
// (numpy.polyfit with w = 1/u and cov = 'unscaled' or cov = True, cross-checked with
// scipy.optimize.curve_fit(absolute_sigma = True); limit by scipy.optimize.brentq, xtol 1e-14; values
// printed to 15 significant digits and compared here to 1e-12).
// Calendar facts (2016, 2020, 2024, 2028 are leap years) from the Gregorian rules.
import { describe, expect, it } from 'vitest'
import { EngineInputError } from '../../../shared/radiometry/errors'
import { driftInterval, predictDrift, staircaseInterval, yearsBetween, type AsFoundPoint, type StaircaseInput } from '../../../shared/quality'

function fieldOf(f: () => unknown): string {
  try {
    f()
  } catch (e) {
    expect(e).toBeInstanceOf(EngineInputError)
    return (e as EngineInputError).field
  }
  return 'no error'
}

describe('staircase (ILAC-G24 method 1)', () => {
  const base: StaircaseInput = { currentMonths: 12, foundInTolerance: true, lengthenFactor: 1.25, shortenFactor: 0.5, minMonths: 3, maxMonths: 24 }

  it('lengthens by a when found in tolerance: 12 × 1.25 = 15', () => {
    const r = staircaseInterval(base)
    expect(r).toMatchObject({ action: 'lengthen', exactMonths: 15, proposedMonths: 15, limitedBy: null })
    expect(r.reason).toBe('Found in tolerance: interval multiplied by a = 1.25, from 12 to 15 months.')
  })

  it('shortens by b when found out of tolerance: 12 × 0.5 = 6; 7 × 0.5 = 3.5 → 3 (down)', () => {
    expect(staircaseInterval({ ...base, foundInTolerance: false })).toMatchObject({ action: 'shorten', proposedMonths: 6 })
    expect(staircaseInterval({ ...base, currentMonths: 7, foundInTolerance: false })).toMatchObject({ exactMonths: 3.5, proposedMonths: 3 })
  })

  it('rounds down, but a lengthening moves at least one month: 3 × 1.25 = 3.75 → 4; 10 × 1.25 = 12.5 → 12', () => {
    expect(staircaseInterval({ ...base, currentMonths: 3 }).proposedMonths).toBe(4)
    expect(staircaseInterval({ ...base, currentMonths: 10 }).proposedMonths).toBe(12)
  })

  it('a product one ulp below a whole number counts as it: 100 × 0.57 is 56.99999999999999 in binary → 57', () => {
    expect(100 * 0.57).toBeLessThan(57) // guard: the case exercises the allowance
    expect(staircaseInterval({ ...base, currentMonths: 100, foundInTolerance: false, shortenFactor: 0.57, maxMonths: 120 }).proposedMonths).toBe(57)
  })

  it('is held within [minMonths, maxMonths]', () => {
    const up = staircaseInterval({ ...base, currentMonths: 20 })
    expect(up).toMatchObject({ exactMonths: 25, proposedMonths: 24, limitedBy: 'maxMonths' })
    expect(up.reason).toMatch(/held at the longest interval, 24 months/)
    const down = staircaseInterval({ ...base, currentMonths: 4, foundInTolerance: false })
    expect(down).toMatchObject({ exactMonths: 2, proposedMonths: 3, limitedBy: 'minMonths' })
  })

  it('80 % variant (common practice): lengthen within 80 % of the MPE, keep above it, shorten when out', () => {
    expect(staircaseInterval({ ...base, fractionOfTolerance: 0.45 })).toMatchObject({ action: 'lengthen', proposedMonths: 15 })
    expect(staircaseInterval({ ...base, fractionOfTolerance: 0.8 })).toMatchObject({ action: 'lengthen' }) // on the threshold: within
    const keep = staircaseInterval({ ...base, fractionOfTolerance: 0.85 })
    expect(keep).toMatchObject({ action: 'keep', proposedMonths: 12 })
    expect(keep.reason).toBe('Found in tolerance, but the largest as-found error used 85 % of the tolerance, more than 80 %: interval kept at 12 months.')
    expect(staircaseInterval({ ...base, fractionOfTolerance: 0.85, lengthenWithinFraction: 0.9 }).action).toBe('lengthen')
    expect(staircaseInterval({ ...base, foundInTolerance: false, fractionOfTolerance: 1.3 }).action).toBe('shorten')
    // kept, but an interval above the longest allowed is still brought down to it
    expect(staircaseInterval({ ...base, currentMonths: 30, fractionOfTolerance: 0.9 })).toMatchObject({ action: 'keep', proposedMonths: 24, limitedBy: 'maxMonths' })
    // guard-banded rules may call a point inside the tolerance "not in tolerance": that is allowed
    expect(staircaseInterval({ ...base, foundInTolerance: false, fractionOfTolerance: 0.95 }).action).toBe('shorten')
  })

  it('rejects bad input with the API field name', () => {
    expect(fieldOf(() => staircaseInterval({ ...base, currentMonths: 0 }))).toBe('currentMonths')
    expect(fieldOf(() => staircaseInterval({ ...base, currentMonths: 6.5 }))).toBe('currentMonths')
    expect(fieldOf(() => staircaseInterval({ ...base, lengthenFactor: 1 }))).toBe('lengthenFactor')
    expect(fieldOf(() => staircaseInterval({ ...base, shortenFactor: 1 }))).toBe('shortenFactor')
    expect(fieldOf(() => staircaseInterval({ ...base, shortenFactor: 0 }))).toBe('shortenFactor')
    expect(fieldOf(() => staircaseInterval({ ...base, minMonths: 0 }))).toBe('minMonths')
    expect(fieldOf(() => staircaseInterval({ ...base, maxMonths: 2 }))).toBe('maxMonths')
    expect(fieldOf(() => staircaseInterval({ ...base, foundInTolerance: 'yes' as never }))).toBe('foundInTolerance')
    expect(fieldOf(() => staircaseInterval({ ...base, fractionOfTolerance: -0.1 }))).toBe('fractionOfTolerance')
    expect(fieldOf(() => staircaseInterval({ ...base, fractionOfTolerance: 1.2 }))).toBe('fractionOfTolerance') // in tolerance but > 1
    expect(fieldOf(() => staircaseInterval({ ...base, fractionOfTolerance: 0.5, lengthenWithinFraction: 0 }))).toBe('lengthenWithinFraction')
  })
})

const P = (date: string, deviation: number, standardUncertainty = 0.1): AsFoundPoint => ({ date, deviation, standardUncertainty })

describe('drift method: exact linear drift, hand-computed', () => {
  // Dates 1461 days (4 Julian years) apart, so t = −8, −4, 0 years exactly; d = 0.2 + 0.1·t K, u = 0.1 K.
  // Line through the points: a = 0.2 K, b = 0.1 K/yr. Equal weights: t̄ = −4, Σ(t − t̄)² = 32, so
  //   Var b = u²/32 = 3.125e-4, Var a = u²(1/3 + t̄²/32) = 8.3333e-3, Cov = −u²·t̄/32 = 1.25e-3.
  // Condition with k = 2, u_m = 0.1, TL = 1:  0.2 + 0.1Δ + 0.2·√(1/3 + (Δ + 4)²/32 + 1) = 1
  //   ⇔ 4/3 + (Δ + 4)²/32 = (4 − 0.5Δ)²  ⇔  21Δ² − 408Δ + 1360 = 0  ⇒  Δ* = (408 − √52224)/42 = 4.27320 yr.
  // 51 months after 2024-01-01 is 2028-04-01 (1552 days = 4.2491 yr ≤ Δ*); 52 months is 2028-05-01
  // (1582 days = 4.3313 yr > Δ*). So the interval is 51 months.
  const history = [P('2020-01-01', -0.2), P('2024-01-01', 0.2), P('2016-01-01', -0.6)] // any order
  const r = driftInterval({ history, tolerance: 1, coverageFactor: 2, maxMonths: 120 })

  it('fit', () => {
    expect(r.originDate).toBe('2024-01-01')
    expect(r.slopePerYear).toBeCloseTo(0.1, 14)
    expect(r.intercept).toBeCloseTo(0.2, 14)
    expect(r.covariance[1][1]).toBeCloseTo(3.125e-4, 15)
    expect(r.covariance[0][0]).toBeCloseTo(0.01 * (1 / 3 + 0.5), 15)
    expect(r.covariance[0][1]).toBeCloseTo(1.25e-3, 15)
    expect(r.covariance[1][0]).toBe(r.covariance[0][1])
    expect(r.chiSquared).toBeCloseTo(0, 20)
    expect(r.birgeRatio).toBeCloseTo(0, 10)
    expect(r.observed.map(p => p.years)).toEqual([-8, -4, 0])
  })

  it('interval', () => {
    expect(r.limitYears).toBeCloseTo((408 - Math.sqrt(52224)) / 42, 10)
    expect(r.limitYears).toBeCloseTo(4.27319738777688, 10) // scipy brentq, same case
    expect(r.months).toBe(51)
    expect(r.dueDate).toBe('2028-04-01')
    expect(r.limitedBy).toBeNull()
    expect(r.reason).toMatch(/fitted drift 0\.1 per year \(away from zero\).*after 4\.273 years: interval 51 months/)
    expect(yearsBetween('2024-01-01', '2028-04-01')).toBeCloseTo(1552 / 365.25, 14)
  })

  it('prediction and chart series', () => {
    const p = predictDrift(r, '2028-01-01') // 4 years exactly
    expect(p.years).toBe(4)
    expect(p.deviation).toBeCloseTo(0.6, 14)
    // u_pred² = 0.01·(1/3 + 64/32 + 1) = 0.033333
    expect(p.uncertainty).toBeCloseTo(Math.sqrt(0.01 * (1 / 3 + 2 + 1)), 14)
    expect(p.expanded).toBeCloseTo(2 * p.uncertainty, 15)
    expect(r.series[0]!.date).toBe('2016-01-01')
    expect(r.series[r.series.length - 1]!.date).toBe('2034-01-01')
    expect(r.series).toHaveLength(96 + 120 + 1)
    const at = r.series.find(s => s.date === '2028-01-01')!
    expect(at.upper).toBeCloseTo(p.deviation + p.expanded, 14)
    expect(at.lower).toBeCloseTo(p.deviation - p.expanded, 14)
  })

  it('the cap: the same history with maxMonths 36 stops at 36', () => {
    const c = driftInterval({ history, tolerance: 1, maxMonths: 36 })
    expect(c).toMatchObject({ months: 36, limitedBy: 'maxMonths', limitYears: null, dueDate: '2027-01-01' })
    expect(c.reason).toMatch(/longest interval allowed: 36 months/)
  })
})

describe('drift method: other shapes, hand-computed', () => {
  it('drift towards zero: the deviation shrinks, crosses zero at 4 yr, then grows (scipy brentq 11.8668881512202 yr)', () => {
    // d = 0.2 − 0.05·t; for Δ > 4: 0.05Δ − 0.2 + 0.2·√(4/3 + (Δ + 4)²/32) = 1 ⇔ 3Δ² − 312Δ + 3280 = 0
    //   ⇒ Δ* = (312 − √57984)/6 = 11.8669 yr; 142 months after 2024-01-01 is 2035-11-01 (numpy script).
    const r = driftInterval({ history: [P('2016-01-01', 0.6), P('2020-01-01', 0.4), P('2024-01-01', 0.2)], tolerance: 1, maxMonths: 180 })
    expect(r.slopePerYear).toBeCloseTo(-0.05, 14)
    expect(r.limitYears).toBeCloseTo((312 - Math.sqrt(57984)) / 6, 10)
    expect(r.months).toBe(142)
    expect(r.dueDate).toBe('2035-11-01')
    expect(r.reason).toMatch(/towards zero/)
  })

  it('no drift: the band alone sets the interval (scipy brentq 7.2736184954957 yr)', () => {
    // two points, t = −4 and 0, d = 0.3: Var(fit at Δ) = u²(1/2 + (Δ + 2)²/8)
    //   0.3 + 0.2·√(1/2 + (Δ + 2)²/8 + 1) = 1 ⇔ (Δ + 2)² = 86 ⇒ Δ* = √86 − 2 = 7.2736 yr;
    //   87 months after 2024-01-01 is 2031-04-01 (2647 days = 7.2471 yr), 88 months is 7.3292 yr.
    const r = driftInterval({ history: [P('2020-01-01', 0.3), P('2024-01-01', 0.3)], tolerance: 1, maxMonths: 120 })
    expect(r.slopePerYear).toBeCloseTo(0, 14)
    expect(r.degreesOfFreedom).toBe(0)
    expect(r.birgeRatio).toBeNull()
    expect(r.limitYears).toBeCloseTo(Math.sqrt(86) - 2, 10)
    expect(r.months).toBe(87)
  })

  it('already out of tolerance at the last calibration: 0 months with a reason', () => {
    const r = driftInterval({ history: [P('2020-01-01', 0.6), P('2024-01-01', 1.05)], tolerance: 1, maxMonths: 60 })
    expect(r).toMatchObject({ months: 0, limitYears: 0, dueDate: '2024-01-01' })
    expect(r.reason).toMatch(/^Already out of tolerance: the last as-found deviation 1\.05 on 2024-01-01/)
  })

  it('inside the tolerance but not by k·u: 0 months with a reason', () => {
    // a = 0.9; Var a = u²(1/2 + 2²/8) = 0.01, u_pred(0) = √(0.01 + 0.01) = 0.141 → 0.9 + 2·0.141 = 1.18 > 1
    const r = driftInterval({ history: [P('2020-01-01', 0.9), P('2024-01-01', 0.9)], tolerance: 1, maxMonths: 60 })
    expect(r.months).toBe(0)
    expect(r.reason).toMatch(/^Already at the tolerance/)
  })

  it('measurementUncertainty 0: only the fit uncertainty counts (longer interval)', () => {
    const history = [P('2016-01-01', -0.6), P('2020-01-01', -0.2), P('2024-01-01', 0.2)]
    const r = driftInterval({ history, tolerance: 1, maxMonths: 120, measurementUncertainty: 0 })
    // 0.2 + 0.1Δ + 0.2·√(1/3 + (Δ+4)²/32) = 1 ⇔ 1/3 + (Δ+4)²/32 = (4 − 0.5Δ)² ⇔ 21Δ² − 408Δ + 1456 = 0
    expect(r.limitYears).toBeCloseTo((408 - Math.sqrt(408 ** 2 - 4 * 21 * 1456)) / 42, 10)
    expect(r.limitYears!).toBeGreaterThan(4.2732)
  })
})

describe('drift method against numpy/scipy (irregular dates, unequal u)', () => {
  const history = [
    P('2019-03-14', 0.05, 0.08),
    P('2020-02-27', 0.11, 0.06),
    P('2021-03-02', 0.16, 0.06),
    P('2022-02-15', 0.27, 0.1),
    P('2023-03-09', 0.3, 0.05),
    P('2024-02-20', 0.38, 0.05),
  ]

  it('weighted fit: numpy.polyfit(w = 1/u, cov = "unscaled")', () => {
    const r = driftInterval({ history, tolerance: 0.8, maxMonths: 120 })
    expect(r.intercept).toBeCloseTo(0.373366387746849, 12)
    expect(r.slopePerYear).toBeCloseTo(0.0669650901742861, 12)
    expect(r.covariance[0][0]).toBeCloseTo(0.0014971941400747, 12)
    expect(r.covariance[0][1]).toBeCloseTo(0.000430191215922415, 12)
    expect(r.covariance[1][1]).toBeCloseTo(0.000211074830876214, 12)
    expect(r.limitYears).toBeCloseTo(3.45986825338072, 9)
    expect(r.months).toBe(41)
    expect(r.dueDate).toBe('2027-07-20')
  })

  it('ordinary fit: numpy.polyfit(cov = True), scaled by RSS/(n − 2)', () => {
    const r = driftInterval({ history, tolerance: 0.8, maxMonths: 120, weighting: 'ordinary' })
    expect(r.intercept).toBeCloseTo(0.377545596563737, 12)
    expect(r.slopePerYear).toBeCloseTo(0.066996622718288, 12)
    expect(r.covariance[0][0]).toBeCloseTo(0.000168823605086906, 12)
    expect(r.covariance[0][1]).toBeCloseTo(4.64240985689453e-5, 12)
    expect(r.covariance[1][1]).toBeCloseTo(1.8750168082168e-5, 12)
    expect(r.residualStandardDeviation).toBeCloseTo(0.017980122244535, 12) // √(RSS/(n − 2)), same script
    expect(r.chiSquared).toBeNull()
    expect(r.limitYears).toBeCloseTo(4.54504498673892, 9)
    expect(r.months).toBe(54)
    expect(r.dueDate).toBe('2028-08-20')
  })
})

describe('drift method: bad input', () => {
  const ok = { history: [P('2020-01-01', 0.1), P('2024-01-01', 0.2)], tolerance: 1, maxMonths: 60 }
  it('rejects with the API field name', () => {
    expect(fieldOf(() => driftInterval({ ...ok, history: [P('2020-01-01', 0.1)] }))).toBe('history')
    expect(fieldOf(() => driftInterval({ ...ok, history: [P('2020-01-01', 0.1), P('2020-01-01', 0.2)] }))).toBe('history')
    expect(fieldOf(() => driftInterval({ ...ok, weighting: 'ordinary' }))).toBe('history') // needs 3
    expect(fieldOf(() => driftInterval({ ...ok, history: [P('2020-02-30', 0.1), P('2024-01-01', 0.2)] }))).toBe('history[0].date')
    expect(fieldOf(() => driftInterval({ ...ok, history: [P('2020-01-01', Number.NaN), P('2024-01-01', 0.2)] }))).toBe('history[0].deviation')
    expect(fieldOf(() => driftInterval({ ...ok, history: [P('2020-01-01', 0.1), P('2024-01-01', 0.2, 0)] }))).toBe('history[1].standardUncertainty')
    expect(fieldOf(() => driftInterval({ ...ok, tolerance: 0 }))).toBe('tolerance')
    expect(fieldOf(() => driftInterval({ ...ok, coverageFactor: -2 }))).toBe('coverageFactor')
    expect(fieldOf(() => driftInterval({ ...ok, maxMonths: 0 }))).toBe('maxMonths')
    expect(fieldOf(() => driftInterval({ ...ok, weighting: 'robust' as never }))).toBe('weighting')
    expect(fieldOf(() => driftInterval({ ...ok, measurementUncertainty: -0.1 }))).toBe('measurementUncertainty')
    expect(fieldOf(() => predictDrift(driftInterval(ok), '2024-13-01'))).toBe('date')
  })
  it('the ordinary fit accepts u = 0 (it does not use the u_i)', () => {
    const r = driftInterval({ history: [P('2016-01-01', 0.1, 0), P('2020-01-01', 0.2, 0), P('2024-01-01', 0.3, 0)], tolerance: 1, maxMonths: 60, weighting: 'ordinary' })
    expect(r.slopePerYear).toBeCloseTo(0.025, 12)
  })
})
