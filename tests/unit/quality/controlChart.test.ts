// Individuals chart of a check standard and its run rules.
// Sources: NIST/SEMATECH e-Handbook of Statistical Methods 6.3.2.2 (individuals chart example, published
// answer); numpy reference values from tests/reference/control_chart.py (numpy.mean, numpy.std(ddof=1),
// numpy.diff; printed to 15 significant digits, compared here to 1e-12); run rules of the Western
// Electric handbook (1956) and Nelson (1984), numbering from memory, checked against the SAS/QC
// documentation of the tests for special causes. Run-rule sequences are made up so that each rule fires
// exactly, or just fails to.
import { describe, expect, it } from 'vitest'
import { EngineInputError } from '../../../shared/radiometry/errors'
import { controlChart, controlLimits, D2_MOVING_RANGE_OF_TWO, evaluateRunRules, type ChartLines, type RunRuleId } from '../../../shared/quality'

function fieldOf(f: () => unknown): string {
  try {
    f()
  } catch (e) {
    expect(e).toBeInstanceOf(EngineInputError)
    return (e as EngineInputError).field
  }
  return 'no error'
}

const NIST_FLOW = [49.6, 47.6, 49.9, 51.3, 47.8, 51.2, 52.6, 52.4, 53.6, 52.1]
const CHECK = [0.12, 0.08, 0.15, 0.1, 0.05, 0.11, 0.14, 0.09, 0.07, 0.13, 0.1, 0.06] // made up, K

describe('control limits', () => {
  it('NIST/SEMATECH e-Handbook 6.3.2.2: x̄ = 50.81, MR̄ = 1.8778, UCL = 55.8041, LCL = 45.8159 (published, 4 decimals)', () => {
    const l = controlLimits(NIST_FLOW, { method: 'moving-range' })
    expect(l.centre).toBeCloseTo(50.81, 4)
    expect(l.movingRangeMean).toBeCloseTo(1.8778, 4)
    expect(l.actionUpper).toBeCloseTo(55.8041, 4)
    expect(l.actionLower).toBeCloseTo(45.8159, 4)
    expect(D2_MOVING_RANGE_OF_TWO).toBe(1.128) // the handbook's d2 for n = 2
  })

  it('NIST example, both methods, against numpy (tests/reference/control_chart.py)', () => {
    const mr = controlLimits(NIST_FLOW, { method: 'moving-range' })
    expect(mr.sigma).toBeCloseTo(1.66469661150512, 12)
    expect(mr.warningLower).toBeCloseTo(47.4806067769898, 12)
    expect(mr.warningUpper).toBeCloseTo(54.1393932230102, 12)
    const sd = controlLimits(NIST_FLOW)
    expect(sd.method).toBe('standard-deviation') // the default
    expect(sd.standardDeviation).toBeCloseTo(2.03385239276491, 12)
    expect(sd.sigma).toBe(sd.standardDeviation)
    expect(sd.warningLower).toBeCloseTo(46.7422952144702, 12)
    expect(sd.warningUpper).toBeCloseTo(54.8777047855298, 12)
    expect(sd.actionLower).toBeCloseTo(44.7084428217053, 12)
    expect(sd.actionUpper).toBeCloseTo(56.9115571782947, 12)
  })

  it('check-standard series (K) against numpy', () => {
    const sd = controlLimits(CHECK)
    expect(sd.centre).toBeCloseTo(0.1, 14)
    expect(sd.sigma).toBeCloseTo(0.0316227766016838, 14)
    expect(sd.actionUpper).toBeCloseTo(0.194868329805051, 14)
    expect(sd.warningLower).toBeCloseTo(0.0367544467966324, 14)
    const mr = controlLimits(CHECK, { method: 'moving-range' })
    expect(mr.movingRangeMean).toBeCloseTo(0.0454545454545455, 14)
    expect(mr.sigma).toBeCloseTo(0.0402965828497743, 14)
    expect(mr.actionLower).toBeCloseTo(-0.020889748549323, 14)
  })

  it('baselineCount: limits come from the first N values only; later values do not move them', () => {
    const withNew = [...CHECK, 0.5, -0.3]
    const l = controlLimits(withNew, { baselineCount: CHECK.length })
    expect(l.baselineCount).toBe(12)
    expect(l.sigma).toBeCloseTo(0.0316227766016838, 14)
    expect(l.centre).toBeCloseTo(0.1, 14)
    expect(controlLimits(withNew).sigma).toBeGreaterThan(0.1) // all points: the outliers inflate s
  })

  it('rejects bad input with the API field name', () => {
    expect(fieldOf(() => controlLimits([1]))).toBe('values')
    expect(fieldOf(() => controlLimits([1, 1, 1]))).toBe('values') // σ = 0
    expect(fieldOf(() => controlLimits([1, Number.NaN, 2]))).toBe('values[1]')
    expect(fieldOf(() => controlLimits([1, 2, 3], { baselineCount: 4 }))).toBe('baselineCount')
    expect(fieldOf(() => controlLimits([1, 2, 3], { baselineCount: 1 }))).toBe('baselineCount')
    expect(fieldOf(() => controlLimits([1, 2, 3], { baselineCount: 2.5 }))).toBe('baselineCount')
    expect(fieldOf(() => controlLimits([1, 2, 3], { method: 'range' as never }))).toBe('method')
  })
})

// Lines of a unit chart: centre 0, σ = 1, warning ± 2, action ± 3.
const UNIT: ChartLines = { centre: 0, sigma: 1, warningLower: -2, warningUpper: 2, actionLower: -3, actionUpper: 3 }
const only = (values: number[], rule: RunRuleId, opts: { runLength?: number, trendLength?: number } = {}) =>
  evaluateRunRules(values, UNIT, { ...opts, rules: [rule] }).map(s => ({ indices: s.indices, side: s.side }))

describe('run rules', () => {
  it('1 point beyond an action limit (WE 1, Nelson 1); exactly on the limit is inside', () => {
    expect(only([0, 3.01, -3.5, 3, -3], 'action-limit')).toEqual([
      { indices: [1], side: 'above' },
      { indices: [2], side: 'below' },
    ])
    expect(only([2.99, -2.99, 3, -3], 'action-limit')).toEqual([])
  })

  it('2 of 3 beyond the same warning limit (WE 2, Nelson 5)', () => {
    expect(only([0, 2.1, 0, 2.2, 0], 'two-of-three-warning')).toEqual([{ indices: [1, 3], side: 'above' }])
    expect(only([0, -2.1, -2.2], 'two-of-three-warning')).toEqual([{ indices: [1, 2], side: 'below' }])
    // just fails: the two points are 3 apart (never 2 in one window of 3)
    expect(only([2.1, 0, 0, 2.2], 'two-of-three-warning')).toEqual([])
    // just fails: opposite sides, or exactly on the warning limits
    expect(only([2.5, -2.5, 0], 'two-of-three-warning')).toEqual([])
    expect(only([2, 2, 0, -2, -2], 'two-of-three-warning')).toEqual([])
  })

  it('4 of 5 beyond 1σ on the same side (WE 3, Nelson 6)', () => {
    expect(only([1.5, 1.2, 0, 1.1, 1.3], 'four-of-five-one-sigma')).toEqual([{ indices: [0, 1, 3, 4], side: 'above' }])
    expect(only([1.5, 1.2, 0, 1.1, 0, 1.3], 'four-of-five-one-sigma')).toEqual([]) // 3 of 5 at most
    expect(only([-1.5, -1.2, 0, -1, -1.3], 'four-of-five-one-sigma')).toEqual([]) // −1 is on the 1σ line, not beyond
  })

  it('9 in a row on one side (Nelson 2); 8 is not enough; a point on the centre line ends a run', () => {
    const nine = Array(9).fill(0.5)
    expect(only(nine, 'run-one-side')).toEqual([{ indices: [0, 1, 2, 3, 4, 5, 6, 7, 8], side: 'above' }])
    expect(only([0.5, ...nine.map(v => -v)], 'run-one-side')).toEqual([{ indices: [1, 2, 3, 4, 5, 6, 7, 8, 9], side: 'below' }])
    expect(only(Array(8).fill(0.5), 'run-one-side')).toEqual([])
    expect(only([0.5, 0.5, 0.5, 0.5, 0, 0.5, 0.5, 0.5, 0.5, 0.5], 'run-one-side')).toEqual([])
  })

  it('runLength 8 (WE 4) and 7 (Grant & Leavenworth) on request', () => {
    const eight = Array(8).fill(-0.2)
    expect(only(eight, 'run-one-side', { runLength: 8 })).toHaveLength(1)
    expect(only(eight.slice(1), 'run-one-side', { runLength: 8 })).toHaveLength(0)
    expect(only(eight.slice(1), 'run-one-side', { runLength: 7 })).toHaveLength(1)
    expect(evaluateRunRules(eight, UNIT, { runLength: 8, rules: ['run-one-side'] })[0]!.label).toBe('8 consecutive points on the same side of the centre line')
  })

  it('6 in a row steadily increasing or decreasing (Nelson 3); 5 is not; a tie ends a trend', () => {
    expect(only([0, 0.1, 0.2, 0.3, 0.4, 0.5], 'trend')).toEqual([{ indices: [0, 1, 2, 3, 4, 5], side: 'increasing' }])
    expect(only([1, 0.5, 0.4, 0.3, 0.2, 0.1, -0.5, 0.2], 'trend')).toEqual([{ indices: [0, 1, 2, 3, 4, 5, 6], side: 'decreasing' }])
    expect(only([0, 0.1, 0.2, 0.3, 0.4], 'trend')).toEqual([])
    expect(only([0, 0.1, 0.2, 0.2, 0.3, 0.4, 0.5], 'trend')).toEqual([])
  })

  it('one signal per occurrence, with every point of the pattern', () => {
    const twelve = Array(12).fill(0.3)
    expect(only(twelve, 'run-one-side')).toEqual([{ indices: twelve.map((_, i) => i), side: 'above' }])
    expect(only([2.5, 2.5, 2.5, 0, 0, 0, 2.5, 2.5], 'two-of-three-warning')).toEqual([
      { indices: [0, 1, 2], side: 'above' },
      { indices: [6, 7], side: 'above' },
    ])
  })

  it('all rules at once, with labels, in rule order', () => {
    const s = evaluateRunRules([0.5, 0.6, 0.7, 0.8, 1.2, 1.3, 2.4, 3.2, 0.4, 0.5], UNIT)
    expect(s.map(x => x.rule)).toEqual(['action-limit', 'two-of-three-warning', 'four-of-five-one-sigma', 'run-one-side', 'trend'])
    expect(s[0]).toMatchObject({ indices: [7], label: '1 point beyond an action limit (± 3σ)' })
    expect(s[1]!.indices).toEqual([6, 7])
    expect(s[2]!.indices).toEqual([4, 5, 6, 7])
    expect(s[3]!.indices).toEqual([0, 1, 2, 3, 4, 5, 6, 7, 8, 9])
    expect(s[4]).toMatchObject({ indices: [0, 1, 2, 3, 4, 5, 6, 7], side: 'increasing' })
  })

  it('the NIST handbook series is in control against its own limits', () => {
    expect(evaluateRunRules(NIST_FLOW, controlLimits(NIST_FLOW, { method: 'moving-range' }))).toEqual([])
  })

  it('rejects bad limits and options with the API field name', () => {
    expect(fieldOf(() => evaluateRunRules([0], { ...UNIT, sigma: 0 }))).toBe('limits.sigma')
    expect(fieldOf(() => evaluateRunRules([0], { ...UNIT, warningUpper: 4 }))).toBe('limits')
    expect(fieldOf(() => evaluateRunRules([0], { ...UNIT, centre: Number.NaN }))).toBe('limits.centre')
    expect(fieldOf(() => evaluateRunRules([0], UNIT, { runLength: 1 }))).toBe('runLength')
    expect(fieldOf(() => evaluateRunRules([0], UNIT, { trendLength: 2 }))).toBe('trendLength')
    expect(fieldOf(() => evaluateRunRules([0], UNIT, { rules: ['nelson-9' as never] }))).toBe('rules[0]')
    expect(fieldOf(() => evaluateRunRules([0, 'x' as never], UNIT))).toBe('values[1]')
  })
})

describe('control chart in one call', () => {
  it('a new point beyond the action limit of a 12-point baseline', () => {
    const c = controlChart([...CHECK, 0.21], { baselineCount: 12 })
    expect(c.limits.actionUpper).toBeCloseTo(0.194868329805051, 14)
    expect(c.points[12]).toEqual({ index: 12, value: 0.21, inBaseline: false, zone: 'beyond-action' })
    expect(c.points[2]!.zone).toBe('within-warning') // 0.15 < 0.1632
    expect(c.signals.map(s => s.rule)).toEqual(['action-limit'])
  })
})
