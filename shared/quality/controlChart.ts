/**
 * Shewhart individuals chart for a check standard (ISO/IEC 17025:2017 7.7.1 b, "use of check or
 * working standards with control charts").
 *
 * Chart (NIST SOP No. 9, "Control Charts for Calibration of Mass Standards", NISTIR 6969; NIST/SEMATECH
 * e-Handbook of Statistical Methods 6.3.2): each check of the check standard is one point;
 * centre line = mean x̄ of the baseline; warning limits x̄ ± 2σ; action limits x̄ ± 3σ.
 *
 * σ is estimated from the baseline in one of two ways:
 * - `'standard-deviation'` (default): σ = s, the sample standard deviation (n − 1 divisor) of the
 *   baseline values. This is how NIST SOP 9 sets the limits of a check-standard chart, and s is the
 *   same long-term standard deviation of the process that the laboratory's uncertainty budget uses,
 *   so chart and budget agree. No c4 bias correction is applied (SOP 9 applies none).
 * - `'moving-range'`: σ̂ = MR̄/d₂ with MR_i = |x_i − x_{i−1}| and d₂ = 1.128 for ranges of two
 *   (NIST/SEMATECH e-Handbook 6.3.2.2; the tabulated d₂ — its exact value is 2/√π = 1.12838, a
 *   0.03 % difference). It is robust to a slow drift or a step inside the baseline, which inflate s
 *   (Nelson 1982, as quoted in the SAS/QC documentation), at the price of a larger sampling error.
 *
 * **Baseline.** Limits are established once from a baseline and then held fixed while new points
 * are judged against them (NIST SOP 9 practice). By default the baseline is every value passed;
 * with `baselineCount: N` it is the first N values (values[0..N−1]) and later values are only judged.
 * To judge the newest point against its history, pass `baselineCount: values.length − 1`; a point
 * inside its own baseline pulls the limits towards itself.
 *
 * Run rules ({@link evaluateRunRules}), each a pattern that is unlikely while the process is in
 * statistical control (Western Electric Statistical Quality Control Handbook, 1956; Nelson 1984,
 * J. Qual. Technol. 16:237 — numbering *from memory*, checked against the SAS/QC documentation of
 * the tests for special causes):
 * - `action-limit`: one point beyond an action limit (WE rule 1, Nelson test 1);
 * - `two-of-three-warning`: 2 of 3 consecutive points beyond the same warning limit (WE rule 2,
 *   Nelson test 5);
 * - `four-of-five-one-sigma`: 4 of 5 consecutive points beyond 1σ on the same side (WE rule 3,
 *   Nelson test 6);
 * - `run-one-side`: 9 consecutive points on the same side of the centre line (Nelson test 2, which
 *   uses nine "to make the chance of a false signal comparable to that of test 1"; WE rule 4 uses
 *   8, Grant & Leavenworth 7 — `runLength` sets it);
 * - `trend`: 6 consecutive points each above (or each below) the one before, i.e. 5 rises or 5 falls
 *   in a row (Nelson test 3 — `trendLength` sets it).
 * "Beyond" a limit is strictly beyond: a point exactly on a limit is inside. A point exactly on the
 * centre line is on neither side and ends a run; two equal consecutive values end a trend.
 */

import { EngineInputError } from '../radiometry/errors'

/** How σ of the chart is estimated from the baseline. */
export type SigmaMethod = 'standard-deviation' | 'moving-range'

/** d₂ for moving ranges of two consecutive points, as tabulated (NIST/SEMATECH e-Handbook 6.3.2.2). */
export const D2_MOVING_RANGE_OF_TWO = 1.128

/** Options of {@link controlLimits}. */
export interface ControlLimitOptions {
  /** σ estimate: `'standard-deviation'` (default, s) or `'moving-range'` (MR̄/1.128). */
  method?: SigmaMethod
  /** Number of leading values that form the baseline (integer ≥ 2); default all values. */
  baselineCount?: number
}

/** The lines of a chart, in the unit of the values (e.g. K). */
export interface ChartLines {
  /** Centre line x̄. */
  centre: number
  /** σ used for the limits (> 0). */
  sigma: number
  /** x̄ − 2σ. */
  warningLower: number
  /** x̄ + 2σ. */
  warningUpper: number
  /** x̄ − 3σ. */
  actionLower: number
  /** x̄ + 3σ. */
  actionUpper: number
}

/** Result of {@link controlLimits}; all values in the unit of the data (e.g. K). */
export interface ControlLimits extends ChartLines {
  /** How σ was estimated. */
  method: SigmaMethod
  /** Number of baseline points (the first `baselineCount` values). */
  baselineCount: number
  /** Sample standard deviation s of the baseline (n − 1 divisor), whatever the method. */
  standardDeviation: number
  /** Mean moving range MR̄ of the baseline, whatever the method. */
  movingRangeMean: number
  /** Where the limits come from, for the chart's caption. */
  reference: string
}

function requireValues(values: unknown): readonly number[] {
  if (!Array.isArray(values)) throw new EngineInputError('values', 'must be an array of numbers')
  values.forEach((v, i) => {
    if (typeof v !== 'number' || !Number.isFinite(v)) throw new EngineInputError(`values[${i}]`, `must be a finite number, got ${String(v)}`)
  })
  return values as readonly number[]
}

/**
 * Centre line, warning (± 2σ) and action (± 3σ) limits of an individuals chart from a baseline.
 * @param values - check-standard results in time order (any one unit, e.g. K or the error in K)
 * @param options - method (`'standard-deviation'` default, or `'moving-range'`) and baselineCount (first N values; default all)
 * @returns centre, σ, the four limits, s and MR̄ of the baseline, the baseline size and a source line (unit of the values)
 * @throws EngineInputError (`values`, `values[i]`, `method`, `baselineCount`); fewer than 2 baseline
 *   values, or a baseline whose σ estimate is zero, is rejected on `values`
 * @example controlLimits([49.6, 47.6, 49.9, 51.3, 47.8, 51.2, 52.6, 52.4, 53.6, 52.1], { method: 'moving-range' })
 *   // centre 50.81, actionUpper 55.8041, actionLower 45.8159 (NIST/SEMATECH e-Handbook 6.3.2.2)
 */
export function controlLimits(values: readonly number[], options: ControlLimitOptions = {}): ControlLimits {
  const all = requireValues(values)
  const method = options.method ?? 'standard-deviation'
  if (method !== 'standard-deviation' && method !== 'moving-range') {
    throw new EngineInputError('method', `must be 'standard-deviation' or 'moving-range', got ${String(method)}`)
  }
  if (all.length < 2) throw new EngineInputError('values', `needs at least 2 values to set limits, got ${all.length}`)
  const n = options.baselineCount ?? all.length
  if (typeof n !== 'number' || !Number.isInteger(n) || n < 2 || n > all.length) {
    throw new EngineInputError('baselineCount', `must be a whole number from 2 to the number of values (${all.length}), got ${String(n)}`)
  }
  const base = all.slice(0, n)
  const mean = base.reduce((a, b) => a + b, 0) / n
  const s = Math.sqrt(base.reduce((a, x) => a + (x - mean) ** 2, 0) / (n - 1))
  let mrSum = 0
  for (let i = 1; i < n; i++) mrSum += Math.abs(base[i]! - base[i - 1]!)
  const mrBar = mrSum / (n - 1)
  const sigma = method === 'standard-deviation' ? s : mrBar / D2_MOVING_RANGE_OF_TWO
  if (!(sigma > 0)) throw new EngineInputError('values', 'the baseline values do not vary (σ estimate is zero); limits cannot be set')
  return {
    method,
    baselineCount: n,
    centre: mean,
    sigma,
    warningLower: mean - 2 * sigma,
    warningUpper: mean + 2 * sigma,
    actionLower: mean - 3 * sigma,
    actionUpper: mean + 3 * sigma,
    standardDeviation: s,
    movingRangeMean: mrBar,
    reference:
      method === 'standard-deviation'
        ? `Shewhart individuals chart, σ = s of the first ${n} points; warning ± 2s, action ± 3s (NIST SOP No. 9)`
        : `Shewhart individuals chart, σ = MR̄/1.128 of the first ${n} points; warning ± 2σ, action ± 3σ (NIST/SEMATECH e-Handbook 6.3.2.2)`,
  }
}

/** Run rules evaluated by {@link evaluateRunRules}. */
export type RunRuleId = 'action-limit' | 'two-of-three-warning' | 'four-of-five-one-sigma' | 'run-one-side' | 'trend'

/** All run rules, in the order they are reported. */
export const RUN_RULES: readonly RunRuleId[] = ['action-limit', 'two-of-three-warning', 'four-of-five-one-sigma', 'run-one-side', 'trend']

/** Options of {@link evaluateRunRules}. */
export interface RunRuleOptions {
  /** Points in a row on one side of the centre line (integer ≥ 2; default 9, Nelson test 2). */
  runLength?: number
  /** Points in a row steadily rising or falling (integer ≥ 3; default 6, Nelson test 3). */
  trendLength?: number
  /** Which rules to apply (default all of {@link RUN_RULES}). */
  rules?: readonly RunRuleId[]
}

/** One occurrence of a run-rule pattern. */
export interface RunRuleSignal {
  /** The rule. */
  rule: RunRuleId
  /** The rule as stated on the chart. */
  label: string
  /** Indices (0-based, into `values`) of the points that form the pattern, ascending. */
  indices: number[]
  /** Side of the centre line, or direction of a trend. */
  side: 'above' | 'below' | 'increasing' | 'decreasing'
}

/**
 * The run rules as stated on the chart.
 * @param runLength - points in a row on one side (default 9)
 * @param trendLength - points in a row rising or falling (default 6)
 * @returns a label for each rule
 */
export function runRuleLabels(runLength = 9, trendLength = 6): Record<RunRuleId, string> {
  return {
    'action-limit': '1 point beyond an action limit (± 3σ)',
    'two-of-three-warning': '2 of 3 consecutive points beyond the same warning limit (± 2σ)',
    'four-of-five-one-sigma': '4 of 5 consecutive points beyond 1σ on the same side',
    'run-one-side': `${runLength} consecutive points on the same side of the centre line`,
    trend: `${trendLength} consecutive points steadily increasing or decreasing`,
  }
}

function requireLines(l: ChartLines): void {
  if (typeof l !== 'object' || l === null) throw new EngineInputError('limits', 'must be an object with centre, sigma and the four limits')
  for (const k of ['centre', 'sigma', 'warningLower', 'warningUpper', 'actionLower', 'actionUpper'] as const) {
    if (typeof l[k] !== 'number' || !Number.isFinite(l[k])) throw new EngineInputError(`limits.${k}`, `must be a finite number, got ${String(l[k])}`)
  }
  if (!(l.sigma > 0)) throw new EngineInputError('limits.sigma', `must be greater than zero, got ${l.sigma}`)
  if (!(l.actionLower < l.warningLower && l.warningLower < l.centre && l.centre < l.warningUpper && l.warningUpper < l.actionUpper)) {
    throw new EngineInputError('limits', 'must satisfy actionLower < warningLower < centre < warningUpper < actionUpper')
  }
}

/**
 * "k of m consecutive points beyond a threshold on one side": windows of the m most recent points
 * (fewer at the start of the series); overlapping windows that signal on the same side merge.
 */
function kOfM(values: readonly number[], k: number, m: number, beyond: (x: number, side: 'above' | 'below') => boolean): { indices: number[], side: 'above' | 'below' }[] {
  const out: { indices: number[], side: 'above' | 'below' }[] = []
  for (const side of ['above', 'below'] as const) {
    let open: { set: Set<number>, lastWindowEnd: number } | null = null
    for (let i = 0; i < values.length; i++) {
      const start = Math.max(0, i - m + 1)
      const hits: number[] = []
      for (let j = start; j <= i; j++) if (beyond(values[j]!, side)) hits.push(j)
      if (hits.length < k) continue
      if (open && open.lastWindowEnd >= start) {
        hits.forEach(h => open!.set.add(h))
        open.lastWindowEnd = i
      } else {
        if (open) out.push({ indices: [...open.set].sort((a, b) => a - b), side })
        open = { set: new Set(hits), lastWindowEnd: i }
      }
    }
    if (open) out.push({ indices: [...open.set].sort((a, b) => a - b), side })
  }
  return out.sort((a, b) => a.indices[0]! - b.indices[0]!)
}

/** Maximal runs of consecutive indices i for which `test(i)` holds, of at least `minLength`. */
function runs(length: number, test: (i: number) => boolean, minLength: number): number[][] {
  const out: number[][] = []
  let cur: number[] = []
  for (let i = 0; i <= length; i++) {
    if (i < length && test(i)) {
      cur.push(i)
    } else {
      if (cur.length >= minLength) out.push(cur)
      cur = []
    }
  }
  return out
}

/**
 * Applies the run rules to a series against fixed chart lines (see the module notes).
 * Each occurrence of a pattern is reported once, with every point that forms it: a run of 12
 * points above the centre line is one `run-one-side` signal with 12 indices.
 * @param values - the series in time order (unit of the limits)
 * @param limits - centre, sigma and the four limits (from {@link controlLimits} or set by hand; unit of the values)
 * @param options - runLength (default 9), trendLength (default 6), rules (default all)
 * @returns the signals, by rule in the order of {@link RUN_RULES}, then by first index; empty when none fire
 * @throws EngineInputError (`values`, `values[i]`, `limits`, `limits.*`, `runLength`, `trendLength`, `rules`)
 * @example evaluateRunRules([0, 2.5, 2.6, 0], { centre: 0, sigma: 1, warningLower: -2, warningUpper: 2, actionLower: -3, actionUpper: 3 })
 *   // [{ rule: 'two-of-three-warning', indices: [1, 2], side: 'above', label: '2 of 3 consecutive points beyond …' }]
 */
export function evaluateRunRules(values: readonly number[], limits: ChartLines, options: RunRuleOptions = {}): RunRuleSignal[] {
  const x = requireValues(values)
  requireLines(limits)
  const runLength = options.runLength ?? 9
  if (!Number.isInteger(runLength) || runLength < 2) throw new EngineInputError('runLength', `must be a whole number ≥ 2, got ${String(runLength)}`)
  const trendLength = options.trendLength ?? 6
  if (!Number.isInteger(trendLength) || trendLength < 3) throw new EngineInputError('trendLength', `must be a whole number ≥ 3, got ${String(trendLength)}`)
  const rules = options.rules ?? RUN_RULES
  if (!Array.isArray(rules)) throw new EngineInputError('rules', 'must be an array of rule names')
  rules.forEach((r, i) => {
    if (!RUN_RULES.includes(r)) throw new EngineInputError(`rules[${i}]`, `unknown rule '${String(r)}'; use ${RUN_RULES.join(', ')}`)
  })
  const labels = runRuleLabels(runLength, trendLength)
  const { centre, sigma } = limits
  const out: RunRuleSignal[] = []
  const push = (rule: RunRuleId, indices: number[], side: RunRuleSignal['side']): void => {
    out.push({ rule, label: labels[rule], indices, side })
  }
  for (const rule of RUN_RULES) {
    if (!rules.includes(rule)) continue
    switch (rule) {
      case 'action-limit':
        x.forEach((v, i) => {
          if (v > limits.actionUpper) push(rule, [i], 'above')
          else if (v < limits.actionLower) push(rule, [i], 'below')
        })
        break
      case 'two-of-three-warning':
        for (const s of kOfM(x, 2, 3, (v, side) => (side === 'above' ? v > limits.warningUpper : v < limits.warningLower))) push(rule, s.indices, s.side)
        break
      case 'four-of-five-one-sigma':
        for (const s of kOfM(x, 4, 5, (v, side) => (side === 'above' ? v > centre + sigma : v < centre - sigma))) push(rule, s.indices, s.side)
        break
      case 'run-one-side': {
        const found = [
          ...runs(x.length, i => x[i]! > centre, runLength).map(r => ({ r, side: 'above' as const })),
          ...runs(x.length, i => x[i]! < centre, runLength).map(r => ({ r, side: 'below' as const })),
        ].sort((a, b) => a.r[0]! - b.r[0]!)
        found.forEach(f => push(rule, f.r, f.side))
        break
      }
      case 'trend': {
        // step i (1 ≤ i < n) rises when x[i] > x[i−1]; a trend of L points is L − 1 rising steps
        const found = [
          ...runs(x.length, i => i > 0 && x[i]! > x[i - 1]!, trendLength - 1).map(r => ({ r, side: 'increasing' as const })),
          ...runs(x.length, i => i > 0 && x[i]! < x[i - 1]!, trendLength - 1).map(r => ({ r, side: 'decreasing' as const })),
        ].sort((a, b) => a.r[0]! - b.r[0]!)
        found.forEach(f => push(rule, [f.r[0]! - 1, ...f.r], f.side))
        break
      }
    }
  }
  return out
}

/** Result of {@link controlChart}. */
export interface ControlChart {
  /** Limits from the baseline. */
  limits: ControlLimits
  /** Run-rule signals over the whole series. */
  signals: RunRuleSignal[]
  /** Each point with its zone, for plotting; `inBaseline` marks the points the limits come from. */
  points: { index: number, value: number, inBaseline: boolean, zone: 'within-warning' | 'between-warning-and-action' | 'beyond-action' }[]
}

/**
 * Limits from the baseline and the run rules over the whole series, in one call.
 * @param values - check-standard results in time order (any one unit, e.g. K)
 * @param options - {@link ControlLimitOptions} and {@link RunRuleOptions}
 * @returns limits, signals and the points with their zones (unit of the values)
 * @throws EngineInputError as {@link controlLimits} and {@link evaluateRunRules}
 * @example controlChart([0.02, -0.01, 0.03, 0.00, -0.02, 0.01, 0.12], { baselineCount: 6 }).points[6].zone // 'beyond-action'
 */
export function controlChart(values: readonly number[], options: ControlLimitOptions & RunRuleOptions = {}): ControlChart {
  const limits = controlLimits(values, options)
  const signals = evaluateRunRules(values, limits, options)
  const points = values.map((value, index) => ({
    index,
    value,
    inBaseline: index < limits.baselineCount,
    zone:
      value > limits.actionUpper || value < limits.actionLower
        ? ('beyond-action' as const)
        : value > limits.warningUpper || value < limits.warningLower
          ? ('between-warning-and-action' as const)
          : ('within-warning' as const),
  }))
  return { limits, signals, points }
}
